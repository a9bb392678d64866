import { Spinner } from '@blueprintjs/core';

export function Loading({ label = 'Loading…' }: { label?: string }) {
  return (
    <div className="ff-loading" aria-busy="true">
      <Spinner size={28} />
      <span>{label}</span>
    </div>
  );
}
