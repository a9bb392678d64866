import { useRef, useState, type DragEvent } from 'react';
import { Button, FileInput, FormGroup, ProgressBar, TextArea } from '@blueprintjs/core';
import { errorMessage } from '../../api/client';
import { useUploadModel } from '../../api/workflow';
import { notify } from '../toaster';
import { Problem } from '../Problem';

/** Drag a model here or pick it; a note travels with it; the upload streams with a progress bar. */
export function UploadPanel({ manuscriptId }: { manuscriptId: string }) {
  const upload = useUploadModel(manuscriptId);
  const [file, setFile] = useState<File | null>(null);
  const [note, setNote] = useState('');
  const [dragging, setDragging] = useState(false);
  const [sent, setSent] = useState(0);
  const depth = useRef(0);

  const onDrop = (e: DragEvent) => {
    e.preventDefault();
    depth.current = 0;
    setDragging(false);
    const f = e.dataTransfer.files[0];
    if (f) setFile(f);
  };

  const submit = () => {
    if (!file) return;
    setSent(0);
    upload.mutate(
      { file, note, onProgress: setSent },
      {
        onSuccess: (v) => {
          notify(`Version ${v.n} stored; its analysis has started.`);
          setFile(null);
          setNote('');
        },
        onError: (e) => notify(errorMessage(e), 'danger'),
      },
    );
  };

  return (
    <section
      className={`ff-dropzone${dragging ? ' ff-dragging' : ''}`}
      aria-label="Upload a model version"
      onDragEnter={(e) => {
        e.preventDefault();
        depth.current++;
        setDragging(true);
      }}
      onDragOver={(e) => e.preventDefault()}
      onDragLeave={() => {
        depth.current = Math.max(0, depth.current - 1);
        if (depth.current === 0) setDragging(false);
      }}
      onDrop={onDrop}
    >
      <FormGroup
        label="Model file"
        labelFor="ff-model-file"
        helperText="PDBx/mmCIF, BinaryCIF or PDB, optionally gzip-compressed. Drop it here or choose it."
      >
        <FileInput
          fill
          text={file ? file.name : 'Choose a model file…'}
          buttonText="Browse"
          hasSelection={file !== null}
          inputProps={{ id: 'ff-model-file', 'aria-label': 'Model file' }}
          onInputChange={(e) => setFile((e.target as HTMLInputElement).files?.[0] ?? null)}
        />
      </FormGroup>
      <FormGroup
        label="Note for this version"
        labelFor="ff-version-note"
        helperText="What changed since the last upload (optional)."
      >
        <TextArea
          id="ff-version-note"
          fill
          value={note}
          maxLength={2000}
          onChange={(e) => setNote(e.target.value)}
        />
      </FormGroup>
      {upload.isPending && (
        <ProgressBar value={sent} intent="primary" aria-label="Upload progress" />
      )}
      {upload.isError && <Problem error={upload.error} />}
      <div>
        <Button
          intent="primary"
          icon="upload"
          text="Upload as new version"
          disabled={!file}
          loading={upload.isPending}
          onClick={submit}
        />
      </div>
    </section>
  );
}
