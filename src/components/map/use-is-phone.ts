import { useEffect, useState } from 'react';

/** Phone layout below Tailwind's `sm` breakpoint (640 px). */
const PHONE_QUERY = '(max-width: 639px)';

/** True while the window is phone-sized; follows rotation and resizing. */
export function useIsPhone(): boolean {
  const [phone, setPhone] = useState(() => typeof window !== 'undefined' && window.matchMedia(PHONE_QUERY).matches);
  useEffect(() => {
    const mq = window.matchMedia(PHONE_QUERY);
    const on = () => setPhone(mq.matches);
    mq.addEventListener('change', on);
    return () => mq.removeEventListener('change', on);
  }, []);
  return phone;
}
