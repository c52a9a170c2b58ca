import { useEffect, useState } from 'react';
import { formatWhen, formatWhenFixed } from '../../lib/client/when';

/** A moment in the one format (src/lib/client/when.ts): fixed on the server and at hydration, the viewer's after mount. */
export function When({ iso }: { iso: string }) {
  const [local, setLocal] = useState(false);
  useEffect(() => setLocal(true), []);
  return <time dateTime={iso} data-when="">{local ? formatWhen(iso) : formatWhenFixed(iso)}</time>;
}
