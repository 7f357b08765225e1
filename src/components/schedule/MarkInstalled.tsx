import { useState } from 'react';
import { useIsLive } from '../ui/use-is-live';
import { useSubmit } from '../ui/use-api';
import { plansApi } from '../../lib/client/plans-api';
import type { PlanDetailJson } from '../../lib/schemas/plans';

interface Props {
  planId: string;
  rowVersion: number;
  customerId: string;
  /** Called with the plan as saved; without it the button shows the next step itself. */
  onInstalled?: (plan: PlanDetailJson) => void;
}

/**
 * "Mark installed" with a second tap to confirm (a slip of the thumb on a roof should not move a
 * job on). A plan changed by someone else since the page loaded is refused (409): reload.
 */
export default function MarkInstalled({ planId, rowVersion, customerId, onInstalled }: Props) {
  const [step, setStep] = useState<'idle' | 'confirm' | 'done'>('idle');
  const marking = useSubmit({ failed: 'Could not mark the plan installed; try again' });
  const live = useIsLive();
  const error = marking.error;

  async function confirm() {
    const result = await marking.submit(() => plansApi.markInstalled(planId, { row_version: rowVersion }));
    setStep(result.ok ? 'done' : 'idle');
    if (result.ok) onInstalled?.(result.data);
  }

  if (step === 'done' && !onInstalled) {
    return (
      <p className="flex flex-wrap items-center gap-2 text-sm" role="status" data-testid="marked-installed">
        <span className="font-semibold text-moss-700">✓ Marked installed</span>
        <a className="btn-primary py-1.5" href={`/customers/${customerId}#plan-${planId}`}>
          Record the install check
        </a>
      </p>
    );
  }

  return (
    <div className="space-y-2">
      {step === 'confirm' ? (
        <div className="flex flex-wrap items-center gap-2" role="group" aria-label="Confirm the install">
          <span className="text-sm font-semibold">Antenna up, aimed and earthed?</span>
          <button type="button" className="btn-primary py-1.5" disabled={marking.pending} onClick={confirm}>
            Yes, mark installed
          </button>
          <button type="button" className="btn-secondary py-1.5" disabled={marking.pending} onClick={() => setStep('idle')}>
            Not yet
          </button>
        </div>
      ) : (
        <button type="button" className="btn-secondary py-1.5" disabled={!live} onClick={() => setStep('confirm')}>
          Mark installed
        </button>
      )}
      {error && (
        <p role="alert" className="rounded border border-alarm-500 bg-alarm-50 p-2 text-sm text-alarm-700">
          {error.message}
          {error.status === 409 && (
            <>
              {' '}
              <a href="" className="font-semibold underline">
                Reload
              </a>
            </>
          )}
        </p>
      )}
    </div>
  );
}
