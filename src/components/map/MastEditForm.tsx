import { useState, type FormEvent } from 'react';
import { ApiError, mastsApi, type FieldErrors, type MastDetailJson } from '../../lib/client/api';
import { checkWith } from '../../lib/client/planning-api';
import { MastChangeSchema } from '../../lib/schemas/masts';
import { FormAlert, withoutFields } from './form-parts';
import { changedMastFields, mastDraftOf, type MastDraft } from './mast-form';
import MastFormFields from './MastFormFields';

interface Props {
  mast: MastDetailJson;
  onSaved: () => void;
  onCancel: () => void;
}

/** Edits a mast's own facts; a stale edit (someone saved first) is refused by the server. */
export default function MastEditForm({ mast, onSaved, onCancel }: Props) {
  const [initial] = useState(() => mastDraftOf(mast));
  const [draft, setDraft] = useState(initial);
  const [errors, setErrors] = useState<FieldErrors>({});
  const [formError, setFormError] = useState<string | null>(null);
  const [stale, setStale] = useState(false);
  const [busy, setBusy] = useState(false);

  async function submit(e: FormEvent) {
    e.preventDefault();
    setErrors({});
    setFormError(null);
    const change = { row_version: mast.row_version, ...changedMastFields(initial, draft) };
    if (Object.keys(change).length === 1) {
      onCancel();
      return;
    }
    const fields = checkWith(MastChangeSchema, change);
    if (fields) {
      setErrors(fields);
      setFormError('Some fields need attention');
      return;
    }
    setBusy(true);
    try {
      await mastsApi.update(mast.id, change);
      onSaved();
    } catch (err) {
      if (err instanceof ApiError) {
        setErrors(err.fields);
        setFormError(err.message);
        setStale(err.status === 409);
      } else setFormError('Could not save the mast');
    } finally {
      setBusy(false);
    }
  }

  return (
    <form onSubmit={submit} noValidate className="space-y-3" aria-label={`Edit ${mast.name}`} data-testid="mast-edit-form">
      <FormAlert message={formError} errors={errors._}>
        {stale && (
          <button type="button" className="btn-secondary mt-2 py-1" onClick={onSaved}>
            Load the latest version
          </button>
        )}
      </FormAlert>
      <MastFormFields
        prefix="mast"
        draft={draft}
        errors={errors}
        onChange={(k, v) => {
          setDraft((d) => ({ ...d, [k]: v }) as MastDraft);
          setErrors((e) => withoutFields(e, k === 'lat' || k === 'lon' ? ['lat', 'lon'] : [k]));
        }}
      />
      <div className="flex gap-2">
        <button type="submit" className="btn-primary" disabled={busy}>
          Save mast
        </button>
        <button type="button" className="btn-secondary" onClick={onCancel} disabled={busy}>
          Cancel
        </button>
      </div>
    </form>
  );
}
