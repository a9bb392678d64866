// A CodeMirror 6 editor: JSON highlighting for figure specs, plain text for Handlebars tables,
// read-only for members who may only view, and the line of a reported error marked.
import { useEffect, useRef } from 'react';
import { basicSetup } from 'codemirror';
import { json } from '@codemirror/lang-json';
import { EditorState, StateEffect, StateField, type Extension } from '@codemirror/state';
import { Decoration, type DecorationSet, EditorView } from '@codemirror/view';

const setErrorLine = StateEffect.define<number | null>();
const errorLineField = StateField.define<DecorationSet>({
  create: () => Decoration.none,
  update(deco, tr) {
    for (const e of tr.effects) {
      if (!e.is(setErrorLine)) continue;
      if (e.value === null || e.value < 1 || e.value > tr.state.doc.lines) return Decoration.none;
      const line = tr.state.doc.line(e.value);
      return Decoration.set([Decoration.line({ class: 'ff-cm-error-line' }).range(line.from)]);
    }
    return deco.map(tr.changes);
  },
  provide: (f) => EditorView.decorations.from(f),
});

export function CodeEditor({
  value,
  onChange,
  language,
  readOnly,
  errorLine,
  label,
}: {
  value: string;
  onChange?: (v: string) => void;
  language: 'json' | 'text';
  readOnly: boolean;
  errorLine?: number | null;
  label: string;
}) {
  const host = useRef<HTMLDivElement>(null);
  const view = useRef<EditorView | null>(null);
  const onChangeRef = useRef(onChange);
  onChangeRef.current = onChange;

  useEffect(() => {
    const exts: Extension[] = [
      basicSetup,
      errorLineField,
      EditorState.readOnly.of(readOnly),
      EditorView.editable.of(!readOnly),
      EditorView.contentAttributes.of({ 'aria-label': label }),
      EditorView.updateListener.of((u) => {
        if (u.docChanged) onChangeRef.current?.(u.state.doc.toString());
      }),
    ];
    if (language === 'json') exts.push(json());
    const v = new EditorView({
      state: EditorState.create({ doc: value, extensions: exts }),
      parent: host.current!,
    });
    view.current = v;
    return () => {
      v.destroy();
      view.current = null;
    };
    // the document is set from outside only when a different version is opened (below)
  }, [language, readOnly, label]);

  useEffect(() => {
    const v = view.current;
    if (v && v.state.doc.toString() !== value)
      v.dispatch({ changes: { from: 0, to: v.state.doc.length, insert: value } });
  }, [value]);

  useEffect(() => {
    view.current?.dispatch({ effects: setErrorLine.of(errorLine ?? null) });
  }, [errorLine]);

  return <div className="ff-code-editor" ref={host} data-testid="code-editor" />;
}
