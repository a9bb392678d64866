import { NonIdealState, type IconName } from '@blueprintjs/core';

/** An honest empty tab: the feature is planned, not hidden behind a fake screen. */
export function LaterRelease({
  icon,
  title,
  description,
}: {
  icon: IconName;
  title: string;
  description: string;
}) {
  return (
    <div className="ff-later">
      <NonIdealState
        icon={icon}
        title={title}
        description={
          <>
            <p>{description}</p>
            <p className="ff-muted">This part of the workspace arrives with a later release.</p>
          </>
        }
      />
    </div>
  );
}
