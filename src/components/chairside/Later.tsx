import { Suspense, type ReactNode } from 'react';

/** A screen loaded on first use (React.lazy), with a plain line while it loads. */
export function Later({ children }: { children: ReactNode }) {
  return <Suspense fallback={<p className="text-lg">Opening…</p>}>{children}</Suspense>;
}
