import { useCallback, useEffect, useState } from 'react';
import type { SignalState } from './signal-layers';
import { readSignalUrl, writeSignalUrl } from './signal-url';

const sameSignal = (a: SignalState, b: SignalState) => a.on === b.on && a.metric === b.metric && a.operatorId === b.operatorId && a.band === b.band;

/**
 * The measured signal layer's choices, kept in the map's address: each change is a new history
 * entry, so Back undoes it, and a reload or a shared link shows the same layer.
 */
export function useSignalUrl(): [SignalState, (next: SignalState) => void] {
  const [signal, setSignal] = useState<SignalState>(() => readSignalUrl(window.location.search));

  const change = useCallback((next: SignalState) => {
    setSignal(next);
    if (sameSignal(readSignalUrl(window.location.search), next)) return;
    window.history.pushState(null, '', `${window.location.pathname}${writeSignalUrl(window.location.search, next)}`);
  }, []);

  useEffect(() => {
    const onPop = () =>
      setSignal((now) => {
        const back = readSignalUrl(window.location.search);
        return sameSignal(now, back) ? now : back;
      });
    window.addEventListener('popstate', onPop);
    return () => window.removeEventListener('popstate', onPop);
  }, []);

  return [signal, change];
}
