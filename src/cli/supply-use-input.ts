/**
 * Reading make and use tables for `requirements`, through src/io: each a wide sheet (CSV, TSV or
 * XLSX) or a long file (row code, column code, then other fields; the value field is detected,
 * or given counted from 1), aligned on industry and commodity codes by `readSupplyUse`.
 */
import type { LayoutPatterns, PatternSet, SupplyUseRead, TableSource } from '../io/index';
import { guessShape, readGrid, readLongGrid, readSupplyUse } from '../io/index';
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

async function source(ctx: CliContext, name: string, role: 'make' | 'use', side: SideFlags): Promise<{ file: InputFile; source: TableSource; shape: 'wide' | 'long' }> {
  const file = await readInput(ctx, name, `${role} table`);
  const sheet = sheetOption(side.sheet);
  const g = await readGrid(file.bytes, { file: file.name === '-' ? `standard input (${role})` : file.name, ...(sheet !== undefined ? { sheet } : {}) });
  const shape = side.valueColumn !== undefined ? 'long' : guessShape(g.grid);
  if (shape === 'long') return { file, source: readLongGrid(g.grid, side.valueColumn !== undefined ? { valueField: side.valueColumn } : {}), shape };
  return { file, source: g.grid, shape };
}

export interface SupplyUseFlags {
  scrap?: string;
  technology?: Technology;
  valueAdded?: string[];
  finalDemand?: string[];
  ignore?: string[];
  blanks?: 'error' | 'zero';
}

export async function loadSupplyUse(ctx: CliContext, make: string, use: string, sides: { make: SideFlags; use: SideFlags }, f: SupplyUseFlags) {
  if (make === '-' && use === '-') throw new UsageError('the make and use tables cannot both come from standard input', 'two-stdin');
  const mk = await source(ctx, make, 'make', sides.make);
  const us = await source(ctx, use, 'use', sides.use);
  const patterns: Partial<Record<keyof LayoutPatterns, Partial<PatternSet>>> = {};
  if (f.valueAdded) patterns.valueAdded = { codes: f.valueAdded };
  if (f.finalDemand) patterns.finalDemand = { codes: f.finalDemand };
  if (f.ignore) patterns.ignore = { codes: f.ignore };
  const read: SupplyUseRead = readSupplyUse(mk.source, us.source, {
    ...(f.scrap !== undefined ? { scrap: f.scrap } : {}),
    ...(f.technology ? { technology: f.technology } : {}),
    ...(Object.keys(patterns).length ? { patterns } : {}),
    ...(f.blanks ? { blanks: f.blanks } : {}),
  });
  return { make: mk, use: us, read };
}
