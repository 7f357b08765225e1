import { useState, type FormEvent } from 'react';
import { checkWith } from '../../lib/client/api';
import { mastsApi } from '../../lib/client/masts-api';
import type { MastDetailJson } from '../../lib/schemas/mast-responses';
import { MastChangeSchema } from '../../lib/schemas/masts';
import { FormActions, FormAlert } from './form-parts';
import { changedMastFields, mastDraftOf, type MastDraft } from './mast-form';
import MastFormFields from './MastFormFields';
import { useMapForm } from './use-map-form';

interface Props {
  mast: MastDetailJson;
  onSaved: () => void;
  onCancel: () => void;
}

/** Edits a mast's own facts; a stale edit (someone saved first) is refused by the server. */
export default function MastEditForm({ mast, onSaved, onCancel }: Props) {
  const [initial] = useState(() => mastDraftOf(mast));
  const [draft, setDraft] = useState(initial);
  const form = useMapForm('Could not save the mast');

  async function submit(e: FormEvent) {
    e.preventDefault();
    const change = { row_version: mast.row_version, ...changedMastFields(initial, draft) };
    if (Object.keys(change).length === 1) {
      onCancel();
      return;
    }
    const sent = await form.submit(() => mastsApi.update(mast.id, change), { check: () => checkWith(MastChangeSchema, change) });
    if (sent.ok) onSaved();
  }

  return (
    <form onSubmit={submit} noValidate className="space-y-3" aria-label={`Edit ${mast.name}`} data-testid="mast-edit-form">
      <FormAlert message={form.message} errors={form.errors._}>
        {form.stale && (
          <button type="button" className="btn-secondary mt-2 py-1" onClick={onSaved}>
            Load the latest version
          </button>
        )}
      </FormAlert>
      <MastFormFields
        prefix="mast"
        draft={draft}
        errors={form.errors}
        onChange={(k, v) => {
          setDraft((d) => ({ ...d, [k]: v }) as MastDraft);
          form.clear(k === 'lat' || k === 'lon' ? ['lat', 'lon'] : [k]);
        }}
      />
      <FormActions submitLabel="Save mast" busy={form.pending} onCancel={onCancel} />
    </form>
  );
}
