/**
 * Reading make and use tables for `requirements`, through src/io: each a wide sheet (CSV, TSV or
 * XLSX) or a long file (row code, column code, then other fields; the value field is detected,
 * or given counted from 1), aligned on industry and commodity codes by `readSupplyUse`.
 */
import type { LayoutPatterns, PatternSet, SupplyUseRead, TableSource } from '../io/index';
import { guessShape, readGrid, readLongSheet, readSupplyUse } from '../io/index';
import type { Technology } from '../../engine/supply-use';
import type { CliContext } from './context';
import { UsageError } from './errors';
import type { InputFile } from './files';
import { readInput } from './files';
import { sheetOption } from './table-input';

export interface SideFlags {
  sheet?: string;
  valueColumn?: number;
}

async function source(ctx: CliContext, name: string, role: 'make' | 'use', side: SideFlags, f: SupplyUseFlags): Promise<{ file: InputFile; source: TableSource; shape: 'wide' | 'long' }> {
  const file = await readInput(ctx, name, `${role} table`);
  const sheet = sheetOption(side.sheet);
  const fileName = file.name === '-' ? `standard input (${role})` : file.name;
  const numbers = { ...(f.decimal ? { decimal: f.decimal } : {}), ...(f.thousands !== undefined ? { thousands: f.thousands } : {}) };
  const g = await readGrid(file.bytes, { file: fileName, ...numbers, ...(sheet !== undefined ? { sheet } : {}) });
  const shape = side.valueColumn !== undefined || f.select ? 'long' : guessShape(g.grid);
  if (shape === 'long') {
    const long = readLongSheet(g, {
      ...numbers,
      ...(side.valueColumn !== undefined ? { valueField: side.valueColumn } : {}),
      ...(f.select ? { select: f.select } : {}),
      ...(f.zeroTexts ? { zeroTexts: f.zeroTexts } : {}),
      ...(f.blanks ? { blanks: f.blanks } : {}),
    });
    long.findings.unshift(...g.findings);
    return { file, source: long, shape };
  }
  return { file, source: g.grid, shape };
}

export interface SupplyUseFlags {
  scrap?: string;
  /** Titles by code from --labels. */
  labels?: ReadonlyMap<string, string>;
  technology?: Technology;
  valueAdded?: string[];
  finalDemand?: string[];
  ignore?: string[];
  blanks?: 'error' | 'zero';
  zeroTexts?: string[];
  decimal?: '.' | ',';
  thousands?: string;
  select?: Record<string, string>;
}

export async function loadSupplyUse(ctx: CliContext, make: string, use: string, sides: { make: SideFlags; use: SideFlags }, f: SupplyUseFlags) {
  if (make === '-' && use === '-') throw new UsageError('the make and use tables cannot both come from standard input', 'two-stdin');
  const mk = await source(ctx, make, 'make', sides.make, f);
  const us = await source(ctx, use, 'use', sides.use, f);
  const patterns: Partial<Record<keyof LayoutPatterns, Partial<PatternSet>>> = {};
  if (f.valueAdded) patterns.valueAdded = { codes: f.valueAdded };
  if (f.finalDemand) patterns.finalDemand = { codes: f.finalDemand };
  if (f.ignore) patterns.ignore = { codes: f.ignore };
  const read: SupplyUseRead = readSupplyUse(mk.source, us.source, {
    ...(f.scrap !== undefined ? { scrap: f.scrap } : {}),
    ...(f.labels ? { labels: f.labels } : {}),
    ...(f.technology ? { technology: f.technology } : {}),
    ...(Object.keys(patterns).length ? { patterns } : {}),
    ...(f.blanks ? { blanks: f.blanks } : {}),
    ...(f.zeroTexts ? { zeroTexts: f.zeroTexts } : {}),
  });
  return { make: mk, use: us, read };
}
