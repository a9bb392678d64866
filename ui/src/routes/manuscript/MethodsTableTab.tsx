import { useEffect, useMemo, useState } from 'react';
import { Button, ButtonGroup, Callout, Card, HTMLSelect, InputGroup, Tag } from '@blueprintjs/core';
import type { ManuscriptDto } from '@foldfolio/shared';
import {
  downloadExport,
  manuscriptApiBase,
  useMethodsTable,
  useSaveMethodsForm,
  type TableValueDto,
} from '../../api/figures';
import { Loading } from '../../components/Loading';
import { Problem } from '../../components/Problem';
import { SafeTable } from '../../components/figures/SafeTable';
import { useChosenVersion } from '../../components/figures/VersionPicker';
import { notify } from '../../components/toaster';
import '../../styles/figures.css';

const SLOTS = [
  { id: '', label: 'For the method of the model' },
  { id: 'methods-xray', label: 'X-ray' },
  { id: 'methods-em', label: 'Cryo-EM' },
  { id: 'methods-nmr', label: 'NMR' },
];
const FORMATS = [
  { id: 'html', label: 'HTML' },
  { id: 'tex', label: 'LaTeX' },
  { id: 'md', label: 'Markdown' },
  { id: 'csv', label: 'CSV' },
  { id: 'docx', label: 'Word (docx)' },
] as const;

function Provenance({ v }: { v: TableValueDto }) {
  if (v.origin === 'file' && v.value === null)
    return <span className="ff-provenance">{'not in the file: enter it here'}</span>;
  const intent = v.origin === 'form' ? 'primary' : v.origin === 'computed' ? 'success' : 'none';
  const text =
    v.origin === 'file'
      ? `from the file: ${v.source}`
      : v.origin === 'form'
        ? 'entered in the form'
        : `computed: ${v.source}`;
  return (
    <span className="ff-provenance">
      <Tag minimal intent={intent}>
        {v.origin}
      </Tag>{' '}
      {text}
    </span>
  );
}

export function MethodsTableTab({ manuscript }: { manuscript: ManuscriptDto }) {
  const { chosen, gate, picker } = useChosenVersion(manuscript.id);
  const [slot, setSlot] = useState('');
  const table = useMethodsTable(manuscript.id, chosen?.id ?? null, slot);
  const save = useSaveMethodsForm(manuscript.id, chosen?.id ?? '');
  const canEdit = manuscript.role === 'owner' || manuscript.role === 'editor';
  const [draft, setDraft] = useState<Record<string, string>>({});
  const [busy, setBusy] = useState<string | null>(null);

  useEffect(() => {
    setDraft({});
  }, [chosen?.id]);

  // every experimental field of the method (filled or not), in table order, then computed values
  const rows = useMemo((): TableValueDto[] => {
    const d = table.data;
    if (!d) return [];
    const byKey = new Map(d.values.map((v) => [v.key, v]));
    const fields = d.fields.map(
      (f): TableValueDto =>
        byKey.get(f.key) ?? { key: f.key, label: f.label, value: null, origin: 'file', source: '' },
    );
    const computed = d.values.filter((v) => v.origin === 'computed');
    return [...fields, ...computed];
  }, [table.data]);

  if (gate) return gate;
  const dirty = Object.keys(draft).length > 0;
  const onSave = () => {
    const values: Record<string, string | number | null> = { ...(table.data?.form ?? {}) };
    for (const [k, v] of Object.entries(draft)) values[k] = v.trim() === '' ? null : v.trim();
    save.mutate(values, {
      onSuccess: () => {
        setDraft({});
        notify('Form saved; the table shows the new values.');
      },
    });
  };
  const exportAs = async (format: string) => {
    setBusy(format);
    try {
      await downloadExport(
        `${manuscriptApiBase(manuscript.id)}/models/${encodeURIComponent(chosen!.id)}/methods-table/export?format=${format}${slot ? `&template=${slot}` : ''}`,
        `${table.data?.key ?? 'methods'}.${format}`,
      );
    } catch (e) {
      notify((e as Error).message, 'danger');
    } finally {
      setBusy(null);
    }
  };

  return (
    <div>
      <div className="ff-toolbar">
        {picker}
        <label className="ff-inline-label">
          Table{' '}
          <HTMLSelect
            value={slot}
            onChange={(e) => setSlot(e.target.value)}
            aria-label="Table template"
          >
            {SLOTS.map((s) => (
              <option key={s.id} value={s.id}>
                {s.label}
              </option>
            ))}
          </HTMLSelect>
        </label>
        <ButtonGroup>
          {FORMATS.map((f) => (
            <Button
              key={f.id}
              small
              icon="download"
              loading={busy === f.id}
              disabled={!table.data}
              onClick={() => exportAs(f.id)}
            >
              {f.label}
            </Button>
          ))}
        </ButtonGroup>
      </div>
      {table.isPending && <Loading label="Rendering the table…" />}
      {table.isError && <Problem error={table.error} />}
      {table.data && (
        <div className="ff-methods-layout">
          <Card>
            <h4 className="bp6-heading">Values and where they come from</h4>
            {!canEdit && (
              <Callout icon="eye-open">
                Owners and editors fill in the form; you can read it.
              </Callout>
            )}
            <div className="ff-form-scroll" data-testid="methods-form">
              {rows.map((v) => (
                <div className="ff-form-row" key={v.key}>
                  <span>{v.label}</span>
                  {v.origin === 'computed' || !canEdit ? (
                    <span className="ff-num">
                      {v.value === null
                        ? '—'
                        : typeof v.value === 'number'
                          ? String(Number(v.value.toPrecision(6)))
                          : v.value}
                    </span>
                  ) : (
                    <InputGroup
                      small
                      aria-label={v.label}
                      value={draft[v.key] ?? (v.value === null ? '' : String(v.value))}
                      onChange={(e) => setDraft((d) => ({ ...d, [v.key]: e.target.value }))}
                    />
                  )}
                  <Provenance v={v} />
                </div>
              ))}
            </div>
            {canEdit && (
              <div className="ff-toolbar">
                <Button
                  intent="primary"
                  disabled={!dirty}
                  loading={save.isPending}
                  onClick={onSave}
                >
                  Save form
                </Button>
                <Button minimal disabled={!dirty} onClick={() => setDraft({})}>
                  Discard changes
                </Button>
              </div>
            )}
            {save.isError && <Problem error={save.error} />}
          </Card>
          <Card>
            <div className="ff-figure-head">
              <h4 className="bp6-heading">Preview</h4>
              <Tag minimal icon="git-commit">
                {table.data.key} · template{' '}
                {table.data.template.templateId.startsWith('builtin:') ? 'built-in' : 'fork'} v
                {table.data.template.n}
              </Tag>
            </div>
            <SafeTable html={table.data.html} />
          </Card>
        </div>
      )}
    </div>
  );
}
