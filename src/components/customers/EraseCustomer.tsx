import { useState } from 'react';
import { customersApi } from '../../lib/client/customers-api';
import type { CustomerErasureJson } from '../../lib/schemas/customers';
import { useSubmit } from '../ui/use-api';

interface Props {
  customerId: string;
  customerName: string;
  onErased: (result: CustomerErasureJson) => void;
}

/** Erasure of the customer's personal data on their request, behind an explicit confirmation. */
export default function EraseCustomer({ customerId, customerName, onErased }: Props) {
  const [confirming, setConfirming] = useState(false);
  const erasing = useSubmit({ failed: 'Could not erase the personal data' });
  const busy = erasing.pending;

  async function erase() {
    const result = await erasing.submit(() => customersApi.erase(customerId));
    if (result.ok) onErased(result.data);
  }

  if (!confirming) {
    return (
      <button type="button" className="btn-secondary py-1 text-alarm-700" onClick={() => setConfirming(true)}>
        Erase personal data…
      </button>
    );
  }
  return (
    <div
      role="alertdialog"
      aria-labelledby="erase-heading"
      aria-describedby="erase-what"
      className="w-full rounded border border-alarm-500 bg-alarm-50 p-3 text-sm"
    >
      <h3 id="erase-heading" className="font-semibold text-alarm-700">
        Erase the personal data of {customerName}?
      </h3>
      <p id="erase-what" className="mt-1 text-ink-700">
        For a customer’s request to be forgotten. Their name, phone, e-mail, address, notes and exact position are removed, here and in the history; plan
        figures that would locate the home (distance, bearings) and readings from their install go too. Plans keep their state, cell, kit and radio figures.
        This cannot be undone.
      </p>
      <div className="mt-2 flex flex-wrap gap-2">
        <button type="button" className="btn-danger py-1" disabled={busy} onClick={erase}>
          {busy ? 'Erasing…' : 'Yes, erase personal data'}
        </button>
        <button type="button" className="btn-secondary py-1" disabled={busy} onClick={() => setConfirming(false)}>
          Cancel
        </button>
      </div>
      {erasing.error && (
        <p role="alert" className="mt-2 text-alarm-700">
          {erasing.error.message}
        </p>
      )}
    </div>
  );
}
