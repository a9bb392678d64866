import {
  Button,
  Callout,
  Card,
  Checkbox,
  FormGroup,
  HTMLTable,
  InputGroup,
  NonIdealState,
  NumericInput,
  ProgressBar,
  Switch,
  Tag,
} from '@blueprintjs/core';
import type {
  CreatedReviewLinkDto,
  ManuscriptDto,
  ReviewLinkDto,
  ReviewPackageDto,
} from '@foldfolio/shared';
import { useState } from 'react';
import { Link } from 'react-router';
import {
  downloadPackage,
  useBuildPackage,
  useCreateLink,
  usePackageAudit,
  usePackages,
  useRevokeLink,
} from '../../api/packages';
import { useModelVersions } from '../../api/workflow';
import { Loading } from '../../components/Loading';
import { Problem } from '../../components/Problem';
import { notify } from '../../components/toaster';
import { formatDateTime } from '../../hooks/format';
import '../../styles/packages.css';

/** Audit actions in words (the codes are ours; the sentences are what owners read). */
const AUDIT_WORDS: Record<string, string> = {
  'package-requested': 'package requested',
  'package-built': 'package built',
  'package-failed': 'package build failed',
  'package-downloaded': 'package downloaded by a member',
  'link-created': 'reviewer link made',
  'link-revoked': 'reviewer link withdrawn',
  'reviewer-opened': 'reviewer opened the link',
  'reviewer-file': 'reviewer viewed a file',
  'reviewer-downloaded': 'reviewer downloaded the package',
  'refused-expired': 'refused: link expired',
  'refused-revoked': 'refused: link withdrawn',
  'refused-wrong-secret': 'refused: wrong link secret',
  'refused-unknown-link': 'refused: unknown link',
};

function size(n: number | null): string {
  if (n === null) return '—';
  if (n >= 1024 * 1024) return `${(n / 1024 / 1024).toFixed(1)} MB`;
  return `${Math.max(1, Math.round(n / 1024))} kB`;
}

function BuildForm({ manuscriptId }: { manuscriptId: string }) {
  const versions = useModelVersions(manuscriptId);
  const build = useBuildPackage(manuscriptId);
  const [chosen, setChosen] = useState<string[]>([]);
  const [includeModel, setIncludeModel] = useState(true);
  const [anonymise, setAnonymise] = useState(false);
  if (versions.isLoading) return <Loading />;
  if (versions.error) return <Problem error={versions.error} />;
  const list = [...(versions.data ?? [])].sort((a, b) => a.n - b.n);
  if (list.length === 0)
    return (
      <Callout icon="info-sign">
        Upload a model version in the Models tab first; a package is frozen from chosen versions.
      </Callout>
    );
  return (
    <Card className="ff-package-form">
      <h4 className="bp6-heading">Freeze a new package</h4>
      <FormGroup label="Model versions to include">
        {list.map((v) => (
          <Checkbox
            key={v.id}
            label={`Version ${v.n}${v.note ? ` — ${v.note}` : ''}`}
            checked={chosen.includes(v.id)}
            onChange={(e) =>
              setChosen((c) =>
                (e.target as HTMLInputElement).checked ? [...c, v.id] : c.filter((x) => x !== v.id),
              )
            }
            data-testid={`package-version-${v.n}`}
          />
        ))}
      </FormGroup>
      <Switch
        checked={includeModel}
        label="Include the model file (turn off for confidential work: reviewers then see figures and tables only)"
        onChange={(e) => setIncludeModel((e.target as HTMLInputElement).checked)}
      />
      <Switch
        checked={anonymise}
        label="Anonymise (no member names, e-mails, comments or uploaded file names)"
        onChange={(e) => setAnonymise((e.target as HTMLInputElement).checked)}
        data-testid="package-anonymise"
      />
      <Problem error={build.error} />
      <Button
        intent="primary"
        icon="box"
        disabled={chosen.length === 0}
        loading={build.isPending}
        onClick={() =>
          build.mutate(
            { modelVersionIds: chosen, includeModel, anonymise },
            { onSuccess: () => notify('The package is being built; it appears below when done.') },
          )
        }
        data-testid="package-build"
      >
        Freeze package
      </Button>
    </Card>
  );
}

function LinkRow({ link, manuscriptId }: { link: ReviewLinkDto; manuscriptId: string }) {
  const revoke = useRevokeLink(manuscriptId);
  return (
    <tr>
      <td>{link.label || '—'}</td>
      <td>{formatDateTime(link.createdAt)}</td>
      <td>{formatDateTime(link.expiresAt)}</td>
      <td>
        <Tag minimal intent={link.state === 'active' ? 'success' : 'none'}>
          {link.state === 'active' ? 'open' : link.state === 'expired' ? 'expired' : 'withdrawn'}
        </Tag>
      </td>
      <td>
        {link.state === 'active' && (
          <Button
            small
            minimal
            intent="danger"
            loading={revoke.isPending}
            onClick={() => revoke.mutate(link.id)}
          >
            Withdraw
          </Button>
        )}
      </td>
    </tr>
  );
}

function ShareForm({ pkg, manuscriptId }: { pkg: ReviewPackageDto; manuscriptId: string }) {
  const create = useCreateLink(manuscriptId);
  const [days, setDays] = useState(30);
  const [label, setLabel] = useState('');
  const [made, setMade] = useState<CreatedReviewLinkDto | null>(null);
  return (
    <div className="ff-share">
      <div className="ff-share-row">
        <InputGroup
          placeholder="Label (e.g. Referee 2)"
          value={label}
          onChange={(e) => setLabel(e.target.value)}
          aria-label="Link label"
        />
        <NumericInput
          min={1}
          max={90}
          value={days}
          onValueChange={(v) => setDays(Number.isFinite(v) ? v : 30)}
          aria-label="Days the link stays open"
          rightElement={<Tag minimal>days</Tag>}
        />
        <Button
          icon="link"
          loading={create.isPending}
          onClick={() =>
            create.mutate(
              { packageId: pkg.id, body: { expiresInDays: days, label } },
              { onSuccess: (r) => setMade(r) },
            )
          }
          data-testid="package-share"
        >
          Make reviewer link
        </Button>
      </div>
      <Problem error={create.error} />
      {made && (
        <Callout intent="success" icon="link" title="Reviewer link">
          <p>Copy it now: it is shown once and only its fingerprint is kept.</p>
          <InputGroup readOnly value={made.url} data-testid="package-link-url" />
          <Button
            small
            icon="clipboard"
            onClick={() =>
              void navigator.clipboard
                ?.writeText(made.url)
                .then(() => notify('Link copied.'))
                .catch(() => notify('Select the link and copy it by hand.'))
            }
          >
            Copy
          </Button>
        </Callout>
      )}
    </div>
  );
}

function PackageCard({
  pkg,
  manuscriptId,
  isOwner,
}: {
  pkg: ReviewPackageDto;
  manuscriptId: string;
  isOwner: boolean;
}) {
  const [downloadError, setDownloadError] = useState<unknown>(null);
  return (
    <Card className="ff-package" data-testid="package-card">
      <div className="ff-version-head">
        <h4 className="bp6-heading">
          {pkg.modelVersions.length === 1 ? 'Version' : 'Versions'}{' '}
          {pkg.modelVersions.map((v) => v.n).join(', ')}
        </h4>
        {pkg.anonymised && <Tag minimal>anonymised</Tag>}
        <Tag minimal>{pkg.includeModel ? 'with model file' : 'without model file'}</Tag>
        <span className="ff-muted">{formatDateTime(pkg.createdAt)}</span>
      </div>
      {(pkg.status === 'queued' || pkg.status === 'building') && (
        <div className="ff-progress" aria-label="Package building">
          <span className="ff-muted">
            {pkg.status === 'queued'
              ? 'Waiting for a worker…'
              : `${pkg.step ?? 'Building'} · ${pkg.progress} %`}
          </span>
          <ProgressBar
            value={pkg.progress / 100}
            intent="primary"
            animate={pkg.status === 'queued'}
          />
        </div>
      )}
      {pkg.status === 'failed' && (
        <Callout intent="danger" icon="error" title="The package could not be built" role="alert">
          {pkg.error ?? 'No reason was recorded.'}
        </Callout>
      )}
      {pkg.status === 'done' && (
        <>
          <p className="ff-muted ff-num" title="SHA-256 of the zip">
            {size(pkg.sizeBytes)} · SHA-256 {pkg.zipSha256?.slice(0, 16)}…
          </p>
          <Button
            icon="download"
            onClick={() => {
              setDownloadError(null);
              downloadPackage(manuscriptId, pkg.id).catch(setDownloadError);
            }}
            data-testid="package-download"
          >
            Download zip
          </Button>
          <Problem error={downloadError} />
          {isOwner && <ShareForm pkg={pkg} manuscriptId={manuscriptId} />}
          {pkg.links.length > 0 && (
            <HTMLTable compact className="ff-links">
              <thead>
                <tr>
                  <th>Label</th>
                  <th>Made</th>
                  <th>Closes</th>
                  <th>State</th>
                  <th />
                </tr>
              </thead>
              <tbody>
                {pkg.links.map((l) => (
                  <LinkRow key={l.id} link={l} manuscriptId={manuscriptId} />
                ))}
              </tbody>
            </HTMLTable>
          )}
        </>
      )}
    </Card>
  );
}

function AuditLog({ manuscriptId }: { manuscriptId: string }) {
  const audit = usePackageAudit(manuscriptId, true);
  if (audit.isLoading) return <Loading />;
  if (audit.error) return <Problem error={audit.error} />;
  const rows = audit.data ?? [];
  return (
    <details>
      <summary>Access log ({rows.length})</summary>
      <HTMLTable compact striped data-testid="package-audit">
        <thead>
          <tr>
            <th>When</th>
            <th>What</th>
            <th>Who</th>
            <th>Detail</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((e) => (
            <tr key={e.id}>
              <td>{formatDateTime(e.createdAt)}</td>
              <td>{AUDIT_WORDS[e.action] ?? e.action}</td>
              <td>{e.userName ?? (e.linkId ? `link holder${e.ip ? ` (${e.ip})` : ''}` : '—')}</td>
              <td>{e.detail}</td>
            </tr>
          ))}
        </tbody>
      </HTMLTable>
    </details>
  );
}

export function ReviewPackagesTab({ manuscript }: { manuscript: ManuscriptDto }) {
  const canBuild = manuscript.role === 'owner' || manuscript.role === 'editor';
  const isOwner = manuscript.role === 'owner';
  const packages = usePackages(manuscript.id);
  if (!canBuild)
    return (
      <NonIdealState
        icon="box"
        title="Review packages"
        description="Owners and editors freeze and share review packages."
      />
    );
  return (
    <div className="ff-packages">
      <p className="ff-muted">
        A package freezes the chosen model versions with every figure, table, the data behind them,
        the report and a manifest of SHA-256 checksums. Anyone can check one on the{' '}
        <Link to="/verify">Verify page</Link> or with <code>npx foldfolio verify</code>.
      </p>
      <BuildForm manuscriptId={manuscript.id} />
      {packages.isLoading && <Loading />}
      <Problem error={packages.error} />
      {packages.data?.length === 0 && <p className="ff-muted">No packages yet.</p>}
      {packages.data?.map((p) => (
        <PackageCard key={p.id} pkg={p} manuscriptId={manuscript.id} isOwner={isOwner} />
      ))}
      {isOwner && <AuditLog manuscriptId={manuscript.id} />}
    </div>
  );
}
