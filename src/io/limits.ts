/**
 * Caps on what a reader accepts, so that a huge or hostile file fails with a clear message that
 * names the limit and how to raise it, long before memory runs out. Library callers pass
 * `limits`; a program can raise the defaults for everything it reads with `setLimits` (the
 * command line does so from `RIPPLEWISE_LIMITS`, as in `RIPPLEWISE_LIMITS=maxSectors=20000`).
 */
import { InputError } from '../../engine/errors';

export interface Limits {
  /** The largest file read, in bytes (default 2 GiB). */
  maxBytes?: number;
  /** The most cells in a grid, or entries in a long file (default 100 million). */
  maxCells?: number;
  /** The largest XLSX file, in bytes, before it is opened (default 256 MiB). */
  maxXlsxBytes?: number;
  /** How far an XLSX archive may expand, in bytes, summed over its parts (default 2 GiB). */
  maxExpandedBytes?: number;
  /** The highest ratio of expanded to compressed size of one part larger than 1 MiB, and of the whole archive (default 250). */
  maxCompressionRatio?: number;
  /** The most sectors in a table (default 10,000: the dense matrices of the model take 8 n² bytes each). */
  maxSectors?: number;
  /** The most scenarios × sectors computed at once (default 2 million: each scenario's impact is a table of sectors by measures). */
  maxScenarioCells?: number;
  /** The deepest nesting of arrays and objects in a JSON file (default 64; the formats of this program need 6). */
  maxJsonDepth?: number;
}

export const DEFAULT_LIMITS: Required<Limits> = {
  maxBytes: 2 * 1024 ** 3,
  maxCells: 100_000_000,
  maxXlsxBytes: 256 * 1024 ** 2,
  maxExpandedBytes: 2 * 1024 ** 3,
  maxCompressionRatio: 250,
  maxSectors: 10_000,
  maxScenarioCells: 2_000_000,
  maxJsonDepth: 64,
};

let raised: Limits = {};

/** Set limits for every later read in this process (over the defaults; limits passed to a reader still win). */
export function setLimits(l: Limits): void {
  raised = { ...l };
}

/** The option each limit is set by, as messages name it: the library name, and where the command line sets it. */
export function limitOption(name: keyof Limits): string {
  return `${name}; on the command line RIPPLEWISE_LIMITS=${name}=N`;
}

/**
 * Limits from text such as `maxSectors=20000,maxCells=2e8` (the RIPPLEWISE_LIMITS variable);
 * an unknown name or a value that is not a positive number is an error naming it.
 */
export function parseLimits(text: string, source = 'RIPPLEWISE_LIMITS'): Limits {
  const out: Record<string, number> = {};
  for (const part of text.split(/[,;\s]+/).filter(Boolean)) {
    const m = /^(\w+)\s*=\s*(.+)$/.exec(part);
    const name = m?.[1];
    if (!m || !name || !(name in DEFAULT_LIMITS)) {
      throw new InputError('bad-limit', `${source}: '${part}' is not a limit; the limits are ${Object.keys(DEFAULT_LIMITS).join(', ')}`, {}, `Write them as ${source}=maxSectors=20000,maxCells=200000000`);
    }
    const v = Number(m[2]!.replace(/_/g, ''));
    if (!Number.isFinite(v) || v <= 0) throw new InputError('bad-limit', `${source}: the limit ${name} must be a positive number, not '${m[2]}'`, {});
    out[name] = v;
  }
  return out as Limits;
}

export function limitsOf(l: Limits | undefined): Required<Limits> {
  return { ...DEFAULT_LIMITS, ...raised, ...(l ?? {}) };
}

/** A table's sector count against maxSectors. */
export function checkSectors(n: number, file: string, limits?: Limits): void {
  const max = limitsOf(limits).maxSectors;
  if (n > max) {
    throw new InputError('too-many-sectors', `file ${file}: the table has ${n.toLocaleString('en')} sectors, over the limit of ${max.toLocaleString('en')} (its model would need ${sizeText(8 * n * n)} for each of its matrices)`, { file }, `Raise the limit (${limitOption('maxSectors')}) if this machine has the memory for it, or aggregate the table first`);
  }
}

/** Scenarios × sectors against maxScenarioCells. */
export function checkScenarioCells(scenarios: number, sectors: number, file: string, limits?: Limits): void {
  const max = limitsOf(limits).maxScenarioCells;
  if (scenarios * sectors > max) {
    throw new InputError(
      'too-many-scenarios',
      `file ${file}: ${scenarios.toLocaleString('en')} scenarios on a table of ${sectors.toLocaleString('en')} sectors are ${(scenarios * sectors).toLocaleString('en')} scenario-sector results, over the limit of ${max.toLocaleString('en')}`,
      { file },
      `Raise the limit (${limitOption('maxScenarioCells')}) if this machine has the memory for it, or run the scenarios in smaller files (a sweep)`,
    );
  }
}

/**
 * The nesting depth of JSON text (arrays and objects), found in one pass that skips strings,
 * held to maxJsonDepth before the text is parsed or walked.
 */
export function checkJsonDepth(text: string, file: string, limits?: Limits): void {
  const max = limitsOf(limits).maxJsonDepth;
  let depth = 0;
  let line = 1;
  for (let i = 0; i < text.length; i++) {
    const ch = text.charCodeAt(i);
    if (ch === 34 /* " */) {
      for (i++; i < text.length; i++) {
        const q = text.charCodeAt(i);
        if (q === 92) i++;
        else if (q === 34) break;
      }
    } else if (ch === 123 || ch === 91) {
      if (++depth > max) {
        throw new InputError('json-too-deep', `file ${file}, line ${line}: the JSON nests arrays and objects more than ${max} deep, over the limit`, { file, row: line }, `Raise the limit (${limitOption('maxJsonDepth')}) if the file is genuine`);
      }
    } else if (ch === 125 || ch === 93) depth--;
    else if (ch === 10) line++;
  }
}

/** A byte count in words: `512 B`, `3.4 MB`, `1.2 GB` (decimal units). */
export function sizeText(bytes: number): string {
  if (bytes < 1000) return `${bytes} B`;
  if (bytes < 1e6) return `${(bytes / 1e3).toFixed(1)} kB`;
  if (bytes < 1e9) return `${(bytes / 1e6).toFixed(1)} MB`;
  return `${(bytes / 1e9).toFixed(2)} GB`;
}

export function checkBytes(size: number, limit: number, file: string, option = 'maxBytes'): void {
  if (size > limit) {
    throw new InputError(
      'too-large',
      `file ${file} is ${sizeText(size)}, over the limit of ${sizeText(limit)}`,
      { file },
      `Raise the limit (${limitOption(option as keyof Limits)}) if this machine has the memory for it, or split the file`,
    );
  }
}

export function tooManyCells(file: string, limit: number): never {
  throw new InputError(
    'too-many-cells',
    `file ${file} has more than ${limit.toLocaleString('en')} cells, over the limit`,
    { file },
    `Raise the limit (${limitOption('maxCells')}) if this machine has the memory for it, or read a smaller part of the table`,
  );
}
