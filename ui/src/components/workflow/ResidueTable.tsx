import { useMemo } from 'react';
import { Menu, MenuItem } from '@blueprintjs/core';
import {
  Cell,
  Column,
  ColumnHeaderCell,
  RenderMode,
  SelectionModes,
  Table2,
} from '@blueprintjs/table';
import type { ResidueRow } from '@foldfolio/shared';
import { outlierCount } from './quality';

export type SortKey =
  | 'outliers'
  | 'position'
  | 'phi'
  | 'psi'
  | 'bMean'
  | 'bondZMax'
  | 'angleZMax'
  | 'cbDeviationA'
  | 'comments';

const angle = (v: number | null | undefined) => (v === null || v === undefined ? '' : v.toFixed(1));
const num = (v: number | null | undefined, d = 2) =>
  v === null || v === undefined ? '' : v.toFixed(d);

interface ColumnDef {
  name: string;
  width: number;
  text: (r: ResidueRow, comments: number) => string;
  sort?: SortKey;
}

const COLUMNS: ColumnDef[] = [
  { name: 'Chain', width: 56, text: (r) => r.chain, sort: 'position' },
  { name: 'Residue', width: 72, text: (r) => r.name },
  { name: 'Number', width: 72, text: (r) => `${r.seq}${r.icode}` },
  { name: 'Alt', width: 40, text: (r) => r.altloc },
  { name: 'φ', width: 64, text: (r) => angle(r.phi), sort: 'phi' },
  { name: 'ψ', width: 64, text: (r) => angle(r.psi), sort: 'psi' },
  { name: 'ω', width: 64, text: (r) => angle(r.omega) },
  { name: 'SS', width: 40, text: (r) => r.ss },
  {
    name: 'Torsion verdict',
    width: 130,
    text: (r) => (r.rama ? `${r.rama.verdict} (${r.rama.class})` : ''),
  },
  {
    name: 'Rotamer',
    width: 110,
    text: (r) =>
      r.rotamer ? `${r.rotamer.verdict}${r.rotamer.name ? ` ${r.rotamer.name}` : ''}` : '',
  },
  { name: 'Cβ dev. Å', width: 80, text: (r) => num(r.cbDeviationA), sort: 'cbDeviationA' },
  { name: 'Bond Z max', width: 84, text: (r) => num(r.bondZMax, 1), sort: 'bondZMax' },
  { name: 'Angle Z max', width: 88, text: (r) => num(r.angleZMax, 1), sort: 'angleZMax' },
  { name: 'Mean B Å²', width: 80, text: (r) => num(r.bMean, 1), sort: 'bMean' },
  { name: 'Flags', width: 260, text: (r) => r.flags.join(', '), sort: 'outliers' },
  { name: 'Comments', width: 80, text: (_r, c) => (c > 0 ? String(c) : ''), sort: 'comments' },
];

export interface TableRowData {
  row: ResidueRow;
  comments: number;
}

function compare(a: TableRowData, b: TableRowData, key: SortKey): number {
  const pos = () =>
    (a.row.chain < b.row.chain ? -1 : a.row.chain > b.row.chain ? 1 : 0) ||
    a.row.seq - b.row.seq ||
    (a.row.icode < b.row.icode ? -1 : a.row.icode > b.row.icode ? 1 : 0) ||
    (a.row.altloc < b.row.altloc ? -1 : a.row.altloc > b.row.altloc ? 1 : 0);
  const numeric = (x: number | null | undefined, y: number | null | undefined) => {
    // missing values sort last whatever the direction
    if (x === null || x === undefined) return y === null || y === undefined ? 0 : 1;
    if (y === null || y === undefined) return -1;
    return y - x;
  };
  switch (key) {
    case 'position':
      return pos();
    case 'outliers':
      return (
        outlierCount(b.row) - outlierCount(a.row) ||
        b.row.flags.length - a.row.flags.length ||
        pos()
      );
    case 'comments':
      return b.comments - a.comments || pos();
    default:
      return numeric(a.row[key], b.row[key]) || pos();
  }
}

export function sortRows(rows: TableRowData[], key: SortKey, ascending: boolean): TableRowData[] {
  const out = [...rows].sort((a, b) => compare(a, b, key));
  return ascending ? out.reverse() : out;
}

/** The per-residue table: virtualised (Blueprint Table2 renders only the visible rows). */
export function ResidueTable({
  rows,
  onOpen,
  onSort,
}: {
  rows: TableRowData[];
  onOpen: (r: TableRowData) => void;
  onSort: (key: SortKey, ascending: boolean) => void;
}) {
  const columns = useMemo(
    () =>
      COLUMNS.map((c) => (
        <Column
          key={c.name}
          name={c.name}
          columnHeaderCellRenderer={() => (
            <ColumnHeaderCell
              name={c.name}
              menuRenderer={
                c.sort
                  ? () => (
                      <Menu>
                        <MenuItem
                          icon="sort-desc"
                          text={c.sort === 'position' ? 'By position' : 'Largest first'}
                          onClick={() => onSort(c.sort as SortKey, false)}
                        />
                        <MenuItem
                          icon="sort-asc"
                          text={c.sort === 'position' ? 'By position, reversed' : 'Smallest first'}
                          onClick={() => onSort(c.sort as SortKey, true)}
                        />
                      </Menu>
                    )
                  : undefined
              }
            />
          )}
          cellRenderer={(i) => {
            const d = rows[i];
            const outlier = c.name === 'Flags' && outlierCount(d.row) > 0;
            return (
              <Cell className={outlier ? 'ff-flag-outlier' : undefined}>
                {c.text(d.row, d.comments)}
              </Cell>
            );
          }}
        />
      )),
    [rows, onSort],
  );
  return (
    <div className="ff-residue-table" data-testid="residue-table">
      <Table2
        numRows={rows.length}
        columnWidths={COLUMNS.map((c) => c.width)}
        enableRowHeader={false}
        selectionModes={SelectionModes.ROWS_AND_CELLS}
        renderMode={RenderMode.BATCH}
        onSelection={(regions) => {
          const r = regions[0]?.rows?.[0];
          if (r !== undefined && rows[r]) onOpen(rows[r]);
        }}
      >
        {columns}
      </Table2>
    </div>
  );
}
