// Check a review package: upload the zip (and, if it holds no model, the model file); the
// service recomputes everything and answers file by file.
import { Button, Callout, Card, FileInput, FormGroup, HTMLTable, Tag } from '@blueprintjs/core';
import type { VerifyFileStatus } from '@foldfolio/shared';
import { useState } from 'react';
import { useVerifyPackage } from '../api/packages';
import { Problem } from '../components/Problem';
import '../styles/packages.css';

const STATUS_WORDS: Record<
  VerifyFileStatus,
  { text: string; intent: 'success' | 'danger' | 'warning' | 'none' }
> = {
  identical: { text: 'identical', intent: 'success' },
  different: { text: 'different', intent: 'danger' },
  missing: { text: 'missing', intent: 'danger' },
  unexpected: { text: 'unexpected', intent: 'warning' },
  'not-recomputed': { text: 'not recomputed', intent: 'none' },
};

export function VerifyPage() {
  const [pkg, setPkg] = useState<File | null>(null);
  const [model, setModel] = useState<File | null>(null);
  const verify = useVerifyPackage();
  const r = verify.data;
  return (
    <div className="ff-verify">
      <h2 className="bp6-heading">Verify a review package</h2>
      <p className="ff-muted">
        Every file is checked against the package's manifest, then recomputed from the model with
        the recorded template versions. The same check runs offline with{' '}
        <code>npx foldfolio verify package.zip</code>.
      </p>
      <Card>
        <FormGroup label="Package (.zip)">
          <FileInput
            text={pkg?.name ?? 'Choose the package…'}
            inputProps={{ accept: '.zip,application/zip', 'aria-label': 'Package zip' }}
            onInputChange={(e) => setPkg((e.target as HTMLInputElement).files?.[0] ?? null)}
          />
        </FormGroup>
        <FormGroup label="Model file (only if the package holds none, or to check another model)">
          <FileInput
            text={model?.name ?? 'Optional…'}
            inputProps={{ 'aria-label': 'Model file' }}
            onInputChange={(e) => setModel((e.target as HTMLInputElement).files?.[0] ?? null)}
          />
        </FormGroup>
        <Button
          intent="primary"
          icon="endorsed"
          disabled={!pkg}
          loading={verify.isPending}
          onClick={() => pkg && verify.mutate({ pkg, model })}
          data-testid="verify-run"
        >
          Check
        </Button>
      </Card>
      <Problem error={verify.error} />
      {r && (
        <section data-testid="verify-result">
          <Callout
            intent={r.ok ? 'success' : 'danger'}
            icon={r.ok ? 'tick-circle' : 'error'}
            title={r.ok ? 'Every file is as recorded' : 'The package does not match'}
          >
            {r.title}: {r.counts.identical} identical, {r.counts.different} different,{' '}
            {r.counts.missing} missing, {r.counts.unexpected} unexpected,{' '}
            {r.counts['not-recomputed']} not recomputed.
            {r.inputNotes.map((n) => (
              <p key={n}>{n}</p>
            ))}
          </Callout>
          <HTMLTable compact striped>
            <thead>
              <tr>
                <th>File</th>
                <th>Result</th>
                <th>What differs</th>
              </tr>
            </thead>
            <tbody>
              {r.files.map((f) => (
                <tr key={f.path} data-status={f.status}>
                  <td>
                    <code>{f.path}</code>
                  </td>
                  <td>
                    <Tag minimal intent={STATUS_WORDS[f.status].intent}>
                      {STATUS_WORDS[f.status].text}
                    </Tag>
                  </td>
                  <td>
                    {f.detail}
                    {f.changedInputs?.length
                      ? ` (depends on changed ${f.changedInputs.join(', ')})`
                      : ''}
                  </td>
                </tr>
              ))}
            </tbody>
          </HTMLTable>
        </section>
      )}
    </div>
  );
}
