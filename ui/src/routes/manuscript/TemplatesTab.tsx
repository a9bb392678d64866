import { useEffect, useMemo, useState } from 'react';
import {
  Button,
  Callout,
  Card,
  Dialog,
  DialogBody,
  DialogFooter,
  FormGroup,
  HTMLSelect,
  InputGroup,
  NonIdealState,
  Radio,
  RadioGroup,
  Tag,
} from '@blueprintjs/core';
import type { ManuscriptDto } from '@foldfolio/shared';
import {
  errorLine,
  previewTemplate,
  useForkTemplate,
  usePins,
  usePinTemplate,
  useSaveTemplateVersion,
  useTemplateDiff,
  useTemplates,
  useTemplateVersion,
  type PreviewDto,
  type TemplateDto,
} from '../../api/figures';
import { useModelVersions } from '../../api/workflow';
import { Loading } from '../../components/Loading';
import { Problem } from '../../components/Problem';
import { CodeEditor } from '../../components/figures/CodeEditor';
import { SafeTable, SvgImage } from '../../components/figures/SafeTable';
import { notify } from '../../components/toaster';
import '../../styles/figures.css';

const ref = (templateId: string, n: number) => `${templateId}@${n}`;
const SCOPE_LABEL = { builtin: 'built-in', lab: 'lab library', manuscript: 'this manuscript' };

function ForkDialog({
  manuscriptId,
  from,
  onClose,
  onForked,
}: {
  manuscriptId: string;
  from: string | null;
  onClose: () => void;
  onForked: (t: TemplateDto) => void;
}) {
  const fork = useForkTemplate(manuscriptId);
  const [name, setName] = useState('');
  const [scope, setScope] = useState<'manuscript' | 'lab'>('manuscript');
  return (
    <Dialog isOpen={from !== null} onClose={onClose} title="Fork a template version">
      <DialogBody>
        <p>
          The fork starts as version 1 with the body of <code>{from}</code>. Every save after that
          adds a numbered version; none is ever changed.
        </p>
        <FormGroup label="Name" labelFor="fork-name">
          <InputGroup id="fork-name" value={name} onChange={(e) => setName(e.target.value)} />
        </FormGroup>
        <RadioGroup
          label="Keep it in"
          selectedValue={scope}
          onChange={(e) => setScope(e.currentTarget.value as 'manuscript' | 'lab')}
        >
          <Radio value="manuscript" label="This manuscript" />
          <Radio value="lab" label="The lab library (every manuscript sees it)" />
        </RadioGroup>
        {fork.isError && <Problem error={fork.error} />}
      </DialogBody>
      <DialogFooter
        actions={
          <>
            <Button onClick={onClose}>Cancel</Button>
            <Button
              intent="primary"
              loading={fork.isPending}
              disabled={!name.trim()}
              onClick={() =>
                fork.mutate(
                  { from: from!, scope, name: name.trim() },
                  {
                    onSuccess: (t) => {
                      notify(`Forked as "${t.name}".`);
                      setName('');
                      onForked(t);
                    },
                  },
                )
              }
            >
              Fork
            </Button>
          </>
        }
      />
    </Dialog>
  );
}

function DiffView({
  manuscriptId,
  choices,
}: {
  manuscriptId: string;
  choices: { value: string; label: string }[];
}) {
  const [from, setFrom] = useState<string | null>(choices[0]?.value ?? null);
  const [to, setTo] = useState<string | null>(choices[choices.length - 1]?.value ?? null);
  const signature = choices.map((c) => c.value).join(' ');
  // a new version or fork resets the comparison to first-versus-newest
  useEffect(() => {
    const values = signature ? signature.split(' ') : [];
    setFrom(values[0] ?? null);
    setTo(values[values.length - 1] ?? null);
  }, [signature]);
  const diff = useTemplateDiff(manuscriptId, from, to);
  const select = (value: string | null, set: (v: string) => void, label: string) => (
    <HTMLSelect value={value ?? ''} onChange={(e) => set(e.target.value)} aria-label={label}>
      {choices.map((c) => (
        <option key={c.value} value={c.value}>
          {c.label}
        </option>
      ))}
    </HTMLSelect>
  );
  const changed = diff.data?.parts.filter((p) => p.added || p.removed).length ?? 0;
  return (
    <div data-testid="template-diff">
      <div className="ff-toolbar">
        Compare {select(from, setFrom, 'Compare from')} with {select(to, setTo, 'Compare with')}
        {diff.data && (
          <Tag minimal>
            {changed === 0 ? 'identical' : `${changed} changed block${changed === 1 ? '' : 's'}`}
          </Tag>
        )}
      </div>
      {diff.isError && <Problem error={diff.error} />}
      {diff.data && (
        <div className="ff-diff">
          {diff.data.parts.map((p, i) => {
            const cls = p.added ? 'ff-diff-add' : p.removed ? 'ff-diff-del' : 'ff-diff-same';
            const lines = p.value.replace(/\n$/, '').split('\n');
            // long unchanged runs fold to their first and last two lines
            const shown =
              !p.added && !p.removed && lines.length > 6
                ? [
                    ...lines.slice(0, 2),
                    `… ${lines.length - 4} unchanged lines …`,
                    ...lines.slice(-2),
                  ]
                : lines;
            return shown.map((l, j) => (
              <span key={`${i}-${j}`} className={cls}>
                {p.added ? '+ ' : p.removed ? '− ' : '  '}
                {l}
              </span>
            ));
          })}
        </div>
      )}
    </div>
  );
}

function Editor({
  manuscriptId,
  template,
  openRef,
  canEdit,
  versionId,
  onSaved,
  manuscriptRole,
}: {
  manuscriptRole: string;
  manuscriptId: string;
  template: TemplateDto;
  openRef: string;
  canEdit: boolean;
  versionId: string | null;
  onSaved: (ref: string) => void;
}) {
  const version = useTemplateVersion(manuscriptId, openRef);
  const save = useSaveTemplateVersion(manuscriptId);
  const editable = canEdit && template.scope !== 'builtin';
  const canEditRole = manuscriptRole === 'owner' || manuscriptRole === 'editor';
  const [body, setBody] = useState('');
  const [message, setMessage] = useState('');
  const [preview, setPreview] = useState<PreviewDto | null>(null);
  const [previewError, setPreviewError] = useState<unknown>(null);

  useEffect(() => {
    if (version.data) setBody(version.data.body);
  }, [version.data]);

  // live preview: the draft rendered on the server a moment after typing stops
  useEffect(() => {
    if (!editable || !versionId || !body) return;
    let cancelled = false;
    const timer = setTimeout(() => {
      previewTemplate(manuscriptId, {
        key: template.key,
        body,
        modelVersionId: versionId,
        templateId: template.id,
      })
        .then((p) => {
          if (cancelled) return;
          setPreview(p);
          setPreviewError(null);
        })
        .catch((e) => !cancelled && setPreviewError(e));
    }, 700);
    return () => {
      cancelled = true;
      clearTimeout(timer);
    };
  }, [body, editable, versionId, manuscriptId, template.key, template.id]);

  if (version.isPending) return <Loading label="Opening the version…" />;
  if (version.isError) return <Problem error={version.error} />;
  const line = errorLine(save.error) ?? errorLine(previewError);
  const unchanged = body === version.data.body;
  return (
    <div className="ff-section" data-testid="template-editor">
      <h4 className="bp6-heading">
        {template.name} · version {version.data.n}{' '}
        <Tag minimal title={version.data.sha256}>
          sha256 {version.data.sha256.slice(0, 12)}
        </Tag>
      </h4>
      {!editable && (
        <Callout icon="eye-open">
          {template.scope === 'builtin'
            ? 'Built-in templates are read-only: fork one to make a house version.'
            : canEditRole
              ? 'This is an earlier version, kept as it was saved: open the newest version to edit, or fork this one.'
              : 'You can read this template; owners and editors save new versions.'}
        </Callout>
      )}
      <div className={editable ? 'ff-editor-layout' : undefined}>
        <CodeEditor
          value={body}
          onChange={editable ? setBody : undefined}
          language={template.kind === 'figure' ? 'json' : 'text'}
          readOnly={!editable}
          errorLine={line}
          label={`${template.name} version ${version.data.n}`}
        />
        {editable && (
          <div className="ff-figure-preview" data-testid="live-preview">
            {!versionId && <span>Upload and analyse a model to see a live preview.</span>}
            {previewError ? (
              <Problem error={previewError} title={line ? `Problem on line ${line}` : 'Problem'} />
            ) : preview?.kind === 'figure' ? (
              <SvgImage svg={preview.svg} alt="Live preview" />
            ) : preview?.kind === 'table' ? (
              <SafeTable html={preview.html} />
            ) : versionId ? (
              <Loading label="Drawing the preview…" />
            ) : null}
          </div>
        )}
      </div>
      {editable && (
        <div className="ff-toolbar">
          <InputGroup
            placeholder="What does this version change?"
            value={message}
            onChange={(e) => setMessage(e.target.value)}
            aria-label="Version message"
            style={{ minWidth: 320 }}
          />
          <Button
            intent="primary"
            icon="floppy-disk"
            disabled={unchanged || !message.trim()}
            loading={save.isPending}
            onClick={() =>
              save.mutate(
                { templateId: template.id, body, message: message.trim() },
                {
                  onSuccess: (v) => {
                    setMessage('');
                    notify(`Saved as version ${v.n}.`);
                    onSaved(ref(template.id, v.n));
                  },
                },
              )
            }
          >
            Save as new version
          </Button>
        </div>
      )}
      {save.isError && <Problem error={save.error} />}
    </div>
  );
}

export function TemplatesTab({ manuscript }: { manuscript: ManuscriptDto }) {
  const templates = useTemplates(manuscript.id);
  const pins = usePins(manuscript.id);
  const pin = usePinTemplate(manuscript.id);
  const versions = useModelVersions(manuscript.id);
  const canEdit = manuscript.role === 'owner' || manuscript.role === 'editor';
  const [slot, setSlot] = useState<string>('torsion-plot');
  const [open, setOpen] = useState<string | null>(null);
  const [forkFrom, setForkFrom] = useState<string | null>(null);

  const inSlot = useMemo(
    () => (templates.data ?? []).filter((t) => t.key === slot),
    [templates.data, slot],
  );
  const choices = useMemo(
    () =>
      inSlot.flatMap((t) =>
        t.versions.map((v) => ({ value: ref(t.id, v.n), label: `${t.name} v${v.n}` })),
      ),
    [inSlot],
  );
  const analysed = versions.data?.find((v) => v.analysis?.status === 'done')?.id ?? null;

  if (templates.isPending || pins.isPending) return <Loading label="Loading templates…" />;
  if (templates.isError) return <Problem error={templates.error} />;
  if (pins.isError) return <Problem error={pins.error} />;
  const pinned = pins.data.find((p) => p.key === slot);
  const openTemplate = open ? inSlot.find((t) => open.startsWith(`${t.id}@`)) : undefined;

  return (
    <div className="ff-templates-layout">
      <Card className="ff-slot-list" data-testid="template-slots">
        <h5 className="bp6-heading">Figures</h5>
        {pins.data
          .filter((p) => p.kind === 'figure')
          .concat([])
          .map((p) => (
            <Button
              key={p.key}
              minimal={p.key !== slot}
              active={p.key === slot}
              onClick={() => {
                setSlot(p.key);
                setOpen(null);
              }}
            >
              {p.title}
              <div className="ff-muted">
                {p.isDefault ? 'built-in' : p.templateName} v{p.n}
              </div>
            </Button>
          ))}
        <h5 className="bp6-heading">Methods tables</h5>
        {pins.data
          .filter((p) => p.kind === 'table')
          .map((p) => (
            <Button
              key={p.key}
              minimal={p.key !== slot}
              active={p.key === slot}
              onClick={() => {
                setSlot(p.key);
                setOpen(null);
              }}
            >
              {p.title}
              <div className="ff-muted">
                {p.isDefault ? 'built-in' : p.templateName} v{p.n}
              </div>
            </Button>
          ))}
      </Card>
      <div>
        {inSlot.length === 0 ? (
          <NonIdealState icon="git-branch" title="No template in this slot" />
        ) : (
          inSlot.map((t) => (
            <Card key={t.id} className="ff-section" data-testid={`template-${t.scope}`}>
              <div className="ff-figure-head">
                <h4 className="bp6-heading">{t.name}</h4>
                <Tag minimal>{SCOPE_LABEL[t.scope]}</Tag>
              </div>
              {t.forkedFrom && <div className="ff-muted">forked from {t.forkedFrom}</div>}
              <table className="ff-version-table">
                <thead>
                  <tr>
                    <th>Version</th>
                    <th>Author</th>
                    <th>Message</th>
                    <th>Saved</th>
                    <th />
                  </tr>
                </thead>
                <tbody>
                  {[...t.versions].reverse().map((v) => {
                    const r = ref(t.id, v.n);
                    const isPinned = pinned?.templateId === t.id && pinned.n === v.n;
                    return (
                      <tr key={r}>
                        <td>
                          v{v.n}{' '}
                          {isPinned && (
                            <Tag intent="success" minimal icon="pin">
                              pinned
                            </Tag>
                          )}
                        </td>
                        <td>{v.author}</td>
                        <td>{v.message}</td>
                        <td>{new Date(v.createdAt).toLocaleDateString()}</td>
                        <td>
                          <Button
                            small
                            minimal
                            icon={
                              canEdit && t.scope !== 'builtin' && v.n === t.latest
                                ? 'edit'
                                : 'eye-open'
                            }
                            onClick={() => setOpen(r)}
                          >
                            {canEdit && t.scope !== 'builtin' && v.n === t.latest ? 'Edit' : 'View'}
                          </Button>
                          {canEdit && (
                            <Button small minimal icon="fork" onClick={() => setForkFrom(r)}>
                              Fork
                            </Button>
                          )}
                          {canEdit && !isPinned && (
                            <Button
                              small
                              minimal
                              icon="pin"
                              loading={pin.isPending && pin.variables?.version === r}
                              onClick={() =>
                                pin.mutate(
                                  { key: slot, version: r },
                                  {
                                    onSuccess: () =>
                                      notify(`Figures and tables now use ${t.name} v${v.n}.`),
                                  },
                                )
                              }
                            >
                              Pin
                            </Button>
                          )}
                        </td>
                      </tr>
                    );
                  })}
                </tbody>
              </table>
            </Card>
          ))
        )}
        {pin.isError && <Problem error={pin.error} />}
        {openTemplate && open && (
          <Card className="ff-section">
            <Editor
              key={open}
              manuscriptId={manuscript.id}
              template={openTemplate}
              openRef={open}
              canEdit={canEdit && openTemplate.latest === Number(open.split('@').pop())}
              versionId={analysed}
              manuscriptRole={manuscript.role}
              onSaved={setOpen}
            />
          </Card>
        )}
        {choices.length > 1 && (
          <Card className="ff-section">
            <h4 className="bp6-heading">Differences between versions</h4>
            <DiffView manuscriptId={manuscript.id} choices={choices} />
          </Card>
        )}
      </div>
      <ForkDialog
        manuscriptId={manuscript.id}
        from={forkFrom}
        onClose={() => setForkFrom(null)}
        onForked={(t) => {
          setForkFrom(null);
          setOpen(ref(t.id, 1));
        }}
      />
    </div>
  );
}
