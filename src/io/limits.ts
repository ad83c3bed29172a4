/** Caps on what a reader accepts, so that a huge or hostile file fails with a clear message. */
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
  /** The highest ratio of expanded to compressed size of one part larger than 1 MiB (default 250). */
  maxCompressionRatio?: number;
}

export const DEFAULT_LIMITS: Required<Limits> = {
  maxBytes: 2 * 1024 ** 3,
  maxCells: 100_000_000,
  maxXlsxBytes: 256 * 1024 ** 2,
  maxExpandedBytes: 2 * 1024 ** 3,
  maxCompressionRatio: 250,
};

export function limitsOf(l: Limits | undefined): Required<Limits> {
  return { ...DEFAULT_LIMITS, ...(l ?? {}) };
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
      `Raise the limit (${option}) if this machine has the memory for it, or split the file`,
    );
  }
}

export function tooManyCells(file: string, limit: number): never {
  throw new InputError(
    'too-many-cells',
    `file ${file} has more than ${limit.toLocaleString('en')} cells, over the limit`,
    { file },
    'Raise the limit (maxCells) if this machine has the memory for it, or read a smaller part of the table',
  );
}
