// The reviewer's page: opened from a link, no account or sign-in. It shows the package's
// figures and tables and offers the zip; every visit is in the owner's access log.
import {
  AnchorButton,
  Callout,
  Card,
  HTMLTable,
  NonIdealState,
  Tab,
  Tabs,
} from '@blueprintjs/core';
import type { ReviewerFileDto } from '@foldfolio/shared';
import { useState } from 'react';
import { useParams } from 'react-router';
import { reviewerFileUrl, reviewerZipUrl, useReviewerPackage } from '../api/packages';
import { Loading } from '../components/Loading';
import { Problem } from '../components/Problem';
import { Wordmark } from '../components/Wordmark';
import { formatDate } from '../hooks/format';
import '../styles/packages.css';

function size(n: number): string {
  if (n >= 1024 * 1024) return `${(n / 1024 / 1024).toFixed(1)} MB`;
  return `${Math.max(1, Math.round(n / 1024))} kB`;
}

function Figures({ token, files }: { token: string; files: ReviewerFileDto[] }) {
  const svgs = files.filter((f) => f.kind === 'figure' && f.path.endsWith('.svg'));
  return (
    <div className="ff-review-figures">
      {svgs.map((f) => (
        <Card key={f.path} className="ff-review-figure">
          <p className="ff-muted">{f.description}</p>
          <img src={reviewerFileUrl(token, f.path)} alt={f.description} loading="lazy" />
          <p>
            <a href={reviewerFileUrl(token, f.path.replace(/\.svg$/, '.pdf'))}>PDF</a> ·{' '}
            <a href={reviewerFileUrl(token, f.path.replace(/\.svg$/, '.data.csv'))}>data (CSV)</a>
          </p>
        </Card>
      ))}
    </div>
  );
}

function Tables({ token, files }: { token: string; files: ReviewerFileDto[] }) {
  const html = files.filter((f) => f.kind === 'table' && f.path.endsWith('.html'));
  return (
    <div>
      {html.map((f) => (
        <Card key={f.path}>
          <p className="ff-muted">{f.description}</p>
          {/* sandboxed: the table is shown, never run (the server also sends a sandbox CSP) */}
          <iframe
            title={f.description}
            src={reviewerFileUrl(token, f.path)}
            sandbox=""
            className="ff-review-table"
          />
        </Card>
      ))}
    </div>
  );
}

function AllFiles({ token, files }: { token: string; files: ReviewerFileDto[] }) {
  return (
    <HTMLTable compact striped>
      <thead>
        <tr>
          <th>File</th>
          <th>What it is</th>
          <th>Size</th>
        </tr>
      </thead>
      <tbody>
        {files.map((f) => (
          <tr key={f.path}>
            <td>
              <a href={reviewerFileUrl(token, f.path)}>
                <code>{f.path}</code>
              </a>
            </td>
            <td>{f.description}</td>
            <td className="ff-num">{size(f.sizeBytes)}</td>
          </tr>
        ))}
      </tbody>
    </HTMLTable>
  );
}

export function ReviewerPage() {
  const { token = '' } = useParams();
  const pkg = useReviewerPackage(token);
  const [tab, setTab] = useState<string>('figures');
  return (
    <div className="ff-review-page">
      <header className="ff-review-head">
        <Wordmark />
      </header>
      {pkg.isLoading && <Loading />}
      {pkg.error ? (
        <NonIdealState icon="lock" title="This review link cannot be opened">
          <Problem error={pkg.error} />
        </NonIdealState>
      ) : null}
      {pkg.data && (
        <main>
          <h2 className="bp6-heading" data-testid="review-title">
            {pkg.data.title}
          </h2>
          <Callout icon="info-sign">
            This package is open to you until {formatDate(pkg.data.expiresAt)}.
            {pkg.data.anonymised ? ' It is anonymised.' : ''} The README inside explains every file;{' '}
            <code>npx foldfolio verify</code> checks that nothing was changed.
          </Callout>
          <p>
            <AnchorButton
              intent="primary"
              icon="download"
              href={reviewerZipUrl(token)}
              download
              data-testid="review-download"
            >
              Download the package ({size(pkg.data.sizeBytes)})
            </AnchorButton>{' '}
            <span className="ff-muted ff-num">SHA-256 {pkg.data.zipSha256}</span>
          </p>
          <Tabs id="review-tabs" selectedTabId={tab} onChange={(t) => setTab(String(t))}>
            <Tab
              id="figures"
              title="Figures"
              panel={<Figures token={token} files={pkg.data.files} />}
            />
            <Tab
              id="tables"
              title="Tables"
              panel={<Tables token={token} files={pkg.data.files} />}
            />
            <Tab
              id="files"
              title="All files"
              panel={<AllFiles token={token} files={pkg.data.files} />}
            />
          </Tabs>
        </main>
      )}
    </div>
  );
}
