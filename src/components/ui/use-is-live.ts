import { useEffect, useState } from 'react';

/** False in the server-rendered HTML and until the island has hydrated; buttons wait on it so an early tap is not lost. */
export function useIsLive(): boolean {
  const [live, setLive] = useState(false);
  useEffect(() => setLive(true), []);
  return live;
}
