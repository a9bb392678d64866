import { useState } from 'react';
import {
  Button,
  ButtonGroup,
  Callout,
  Card,
  Collapse,
  HTMLSelect,
  NumericInput,
  Switch,
  Tag,
} from '@blueprintjs/core';
import type { ManuscriptDto } from '@foldfolio/shared';
import {
  downloadExport,
  figureQuery,
  manuscriptApiBase,
  useFigure,
  useFigureCatalog,
  type FigureCatalog,
  type FigureDto,
} from '../../api/figures';
import { ApiError } from '../../api/client';
import { Loading } from '../../components/Loading';
import { Problem } from '../../components/Problem';
import { SvgImage } from '../../components/figures/SafeTable';
import { useChosenVersion } from '../../components/figures/VersionPicker';
import { notify } from '../../components/toaster';
import '../../styles/figures.css';

type Params = Record<string, number | string | boolean>;

function ReadinessBadge({ fig }: { fig: FigureDto }) {
  const r = fig.readiness;
  if (r.ok)
    return (
      <Tag intent="success" icon="tick" minimal data-testid="readiness-ok">
        Journal-ready
      </Tag>
    );
  return (
    <div className="ff-readiness" data-testid="readiness-issues">
      <Tag intent="warning" icon="warning-sign" minimal>
        {r.issues.length} readiness {r.issues.length === 1 ? 'issue' : 'issues'}
      </Tag>
      <ul>
        {r.issues.map((i, k) => (
          <li key={k}>
            <strong>{i.check}</strong>: {i.message} <code>{i.element}</code>
          </li>
        ))}
      </ul>
    </div>
  );
}

function FigureCard({
  manuscriptId,
  versionId,
  preset,
  spec,
}: {
  manuscriptId: string;
  versionId: string;
  preset: string;
  spec: FigureCatalog['figures'][number];
}) {
  const [params, setParams] = useState<Params>({});
  const [open, setOpen] = useState(false);
  const [dpi, setDpi] = useState(300);
  const [busy, setBusy] = useState<string | null>(null);
  const fig = useFigure(manuscriptId, versionId, spec.key, preset, params);
  const setParam = (name: string, v: number | string | boolean) =>
    setParams((p) => ({ ...p, [name]: v }));
  const value = (name: string) =>
    params[name] ?? spec.parameters.find((p) => p.name === name)!.default;

  const exportAs = async (format: 'svg' | 'pdf' | 'png') => {
    setBusy(format);
    try {
      const q = `${figureQuery(preset, params)}&format=${format}${format === 'png' ? `&dpi=${dpi}` : ''}`;
      await downloadExport(
        `${manuscriptApiBase(manuscriptId)}/models/${encodeURIComponent(versionId)}/figures/${spec.key}/export?${q}`,
        `${spec.key}.${preset}.${format}`,
      );
    } catch (e) {
      notify((e as Error).message, 'danger');
    } finally {
      setBusy(null);
    }
  };

  const needsSecond = fig.error instanceof ApiError && fig.error.status === 409;
  return (
    <Card className="ff-figure-card" data-testid={`figure-${spec.key}`}>
      <div className="ff-figure-head">
        <h4 className="bp6-heading">{spec.title}</h4>
        <Tag minimal icon="git-commit" title="The template version this manuscript pins">
          {spec.template.isDefault ? 'built-in' : spec.template.name} v{spec.template.n}
        </Tag>
      </div>
      <div className="ff-figure-preview">
        {fig.isPending && <Loading label="Drawing…" />}
        {needsSecond && <Callout icon="info-sign">{(fig.error as Error).message}</Callout>}
        {fig.isError && !needsSecond && <Problem error={fig.error} />}
        {fig.data && <SvgImage svg={fig.data.svg} alt={spec.title} />}
      </div>
      {fig.data && <ReadinessBadge fig={fig.data} />}
      <div className="ff-figure-actions">
        <ButtonGroup>
          <Button
            small
            icon="download"
            loading={busy === 'svg'}
            onClick={() => exportAs('svg')}
            disabled={!fig.data}
          >
            SVG
          </Button>
          <Button
            small
            icon="download"
            loading={busy === 'pdf'}
            onClick={() => exportAs('pdf')}
            disabled={!fig.data}
          >
            PDF
          </Button>
          <Button
            small
            icon="download"
            loading={busy === 'png'}
            onClick={() => exportAs('png')}
            disabled={!fig.data}
          >
            PNG
          </Button>
        </ButtonGroup>
        <label className="ff-inline-label">
          at{' '}
          <HTMLSelect
            value={dpi}
            onChange={(e) => setDpi(Number(e.target.value))}
            aria-label="PNG resolution"
          >
            {[150, 300, 600, 1200].map((d) => (
              <option key={d} value={d}>
                {d} dpi
              </option>
            ))}
          </HTMLSelect>
        </label>
        {spec.parameters.length > 0 && (
          <Button small minimal icon="settings" onClick={() => setOpen(!open)}>
            Options
          </Button>
        )}
      </div>
      <Collapse isOpen={open}>
        <div className="ff-figure-options">
          {spec.parameters.map((p) =>
            p.type === 'boolean' ? (
              <Switch
                key={p.name}
                label={p.description}
                checked={Boolean(value(p.name))}
                onChange={(e) => setParam(p.name, e.currentTarget.checked)}
              />
            ) : p.type === 'number' ? (
              <label key={p.name} className="ff-option-row">
                <span>{p.description}</span>
                <NumericInput
                  small
                  value={Number(value(p.name))}
                  min={p.min}
                  max={p.max}
                  onValueChange={(v) => Number.isFinite(v) && setParam(p.name, v)}
                />
              </label>
            ) : null,
          )}
        </div>
      </Collapse>
    </Card>
  );
}

export function FiguresTab({ manuscript }: { manuscript: ManuscriptDto }) {
  const catalog = useFigureCatalog(manuscript.id);
  const { chosen, gate, picker } = useChosenVersion(manuscript.id);
  const [preset, setPreset] = useState('single');
  if (gate) return gate;
  if (catalog.isPending) return <Loading label="Loading figures…" />;
  if (catalog.isError) return <Problem error={catalog.error} />;
  return (
    <div>
      <div className="ff-toolbar">
        {picker}
        <label className="ff-inline-label">
          Width{' '}
          <HTMLSelect
            value={preset}
            onChange={(e) => setPreset(e.target.value)}
            aria-label="Preset"
          >
            {catalog.data.presets.map((p) => (
              <option key={p.id} value={p.id}>
                {p.name} ({p.widthMm} mm)
              </option>
            ))}
          </HTMLSelect>
        </label>
      </div>
      <div className="ff-figure-gallery">
        {catalog.data.figures.map((f) => (
          <FigureCard
            key={f.key}
            manuscriptId={manuscript.id}
            versionId={chosen!.id}
            preset={preset}
            spec={f}
          />
        ))}
      </div>
    </div>
  );
}
