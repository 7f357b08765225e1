// A block that keyboard and screen reader users are taken to: a question, a refusal, a popup's figures.
import { useEffect, useRef, type HTMLAttributes } from 'react';

/** A block that takes the focus when it appears and again whenever `focusKey` changes (a new question, a new pick). */
export function FocusBlock({ focusKey, ...div }: HTMLAttributes<HTMLDivElement> & { focusKey?: unknown }) {
  const ref = useRef<HTMLDivElement>(null);
  useEffect(() => ref.current?.focus(), [focusKey]);
  return <div ref={ref} tabIndex={-1} {...div} />;
}
