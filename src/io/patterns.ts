/**
 * Which codes and labels mark final demand, value added, imports, totals, output, satellites,
 * or rows and columns to ignore. Codes are matched by glob (`F*`, `V0??`; `*` any run of
 * characters, `?` one), case-insensitively; labels by regular expressions (sources, as text, so
 * that a mapping file can carry them), case-insensitively.
 *
 * The defaults are plain words of the trade, the common one-letter code prefixes and the
 * transaction codes of the System of National Accounts (2008 SNA, used by ESA 2010 too): P3
 * final consumption, P5 capital formation, P6 exports, P7 imports, D1 compensation of employees,
 * D2/D3 taxes and subsidies, B2/B3 operating surplus and mixed income, B1 value added (a
 * subtotal), P1 output, P2 intermediate consumption (a total). They are options, never one
 * agency's codes. A code that names both a row and a column of the table is a
 * sector whatever pattern it matches (so that a sector coded `F`, construction in some
 * classifications, stays a sector).
 */
import { InputError } from '../../engine/errors';

export interface PatternSet {
  /** Globs for codes. */
  codes: string[];
  /** Regular expressions (as text) for labels. */
  labels: string[];
}

export interface LayoutPatterns {
  finalDemand: PatternSet;
  valueAdded: PatternSet;
  imports: PatternSet;
  totals: PatternSet;
  output: PatternSet;
  satellite: PatternSet;
  ignore: PatternSet;
}

export const DEFAULT_PATTERNS: LayoutPatterns = {
  finalDemand: {
    codes: ['F*', 'P3*', 'P5*', 'P6*'],
    labels: [
      '^(total\\s+)?final\\s+(demand|uses?|consumption)\\b',
      '^(private\\s+|household\\s+|households\\W+\\s*|personal\\s+|government\\s+|final\\s+)?consumption\\b',
      '^households?\\b',
      '^personal consumption',
      '^(general\\s+)?government\\b',
      '^(federal|state and local|central|local)\\s+government',
      '^npish\\b',
      '^non-?profit institutions',
      '^(gross\\s+)?(fixed\\s+)?capital formation',
      '^gfcf\\b',
      '^(private\\s+|gross\\s+)?(fixed\\s+)?investment\\b',
      '^(changes?|increase) in (private\\s+)?(inventor|stocks|valuables)',
      '^inventor(y|ies)\\b',
      '^acquisitions less disposals',
      '^exports?\\b',
      '^imports?\\b',
    ],
  },
  valueAdded: {
    codes: ['V*', 'D1', 'D1?', 'D2*', 'D3*', 'D29*', 'B2*', 'B3*', 'K1', 'P51C*'],
    labels: [
      '^(gross\\s+|net\\s+)?value\\s+added\\b',
      '^compensation\\b',
      '^(employee|labou?r)\\s+(compensation|income|costs?)\\b',
      '^wages\\b',
      '^salaries\\b',
      '^(other\\s+)?(net\\s+)?taxes\\b',
      '^(other\\s+)?subsidies\\b',
      '^indirect business tax',
      '^(gross\\s+|net\\s+)?operating surplus',
      '^(gross\\s+|net\\s+)?mixed income',
      '^consumption of fixed capital',
      '^depreciation\\b',
      '^(gross\\s+)?profits?\\b',
      '^proprietors',
      '^property[- ]type income',
      '^other value added',
      '^primary inputs?\\b',
    ],
  },
  imports: {
    codes: ['IMP', 'IMP*', 'P7*'],
    labels: ['^(total\\s+)?(intermediate\\s+)?imports?\\b', '^imported (inputs|goods)', '^competitive imports'],
  },
  totals: {
    codes: ['T*', 'B1*', 'P2'],
    labels: ['^(grand\\s+|sub-?)?totals?\\b', '\\btotals?$', '^sum\\b'],
  },
  output: {
    codes: ['x', 'output', 'out', 'P1'],
    labels: ['^(total\\s+)?(gross\\s+)?(industry\\s+|commodity\\s+|product\\s+|domestic\\s+)?output(\\s+at\\s+[a-z\'’]+\\s+prices)?\\s*$', '^x$'],
  },
  satellite: {
    codes: [],
    labels: ['^employment\\b', '^jobs\\b', '^(number of\\s+)?(employees|persons employed)\\b', '^full[- ]time equivalent', '^fte\\b', '^(ghg\\s+|co2\\s+|greenhouse gas\\s+)?emissions?\\b', '^(co2|ghg|greenhouse)', '^(energy|water)\\s+(use|consumption|withdrawals?)\\b'],
  },
  ignore: { codes: [], labels: [] },
};

export const PATTERN_KEYS = Object.keys(DEFAULT_PATTERNS) as (keyof LayoutPatterns)[];

/** Defaults with the given sets replacing theirs (a set given in part keeps the other half). */
export function resolvePatterns(p?: Partial<Record<keyof LayoutPatterns, Partial<PatternSet>>>): LayoutPatterns {
  const out = {} as LayoutPatterns;
  for (const k of PATTERN_KEYS) {
    const given = p?.[k];
    if (given !== undefined && (typeof given !== 'object' || given === null)) {
      throw new InputError('bad-mapping', `patterns.${k} must be an object with 'codes' and 'labels' lists`);
    }
    const codes = given?.codes ?? DEFAULT_PATTERNS[k].codes;
    const labels = given?.labels ?? DEFAULT_PATTERNS[k].labels;
    for (const [what, list] of [['codes', codes], ['labels', labels]] as const) {
      if (!Array.isArray(list) || list.some((x) => typeof x !== 'string')) {
        throw new InputError('bad-mapping', `patterns.${k}.${what} must be a list of texts`);
      }
    }
    for (const l of labels) {
      try {
        new RegExp(l, 'i');
      } catch (e) {
        throw new InputError('bad-mapping', `patterns.${k}.labels: '${l}' is not a valid regular expression (${(e as Error).message})`);
      }
    }
    out[k] = { codes: [...codes], labels: [...labels] };
  }
  return out;
}

/** A compiled pattern set. */
export class Matcher {
  private codeRes: RegExp[];
  private labelRes: RegExp[];
  constructor(readonly set: PatternSet) {
    this.codeRes = set.codes.map(globToRegExp);
    this.labelRes = set.labels.map((l) => new RegExp(l, 'i'));
  }
  /** The glob that matches a code, if any. */
  code(code: string): string | undefined {
    const i = this.codeRes.findIndex((r) => r.test(code));
    return i >= 0 ? this.set.codes[i] : undefined;
  }
  /** The expression that matches a label, if any. */
  label(label: string): string | undefined {
    const i = this.labelRes.findIndex((r) => r.test(label));
    return i >= 0 ? this.set.labels[i] : undefined;
  }
}

export function globToRegExp(glob: string): RegExp {
  const body = glob.replace(/[.+^${}()|[\]\\]/g, '\\$&').replace(/\*/g, '.*').replace(/\?/g, '.');
  return new RegExp(`^${body}$`, 'i');
}

export type CompiledPatterns = Record<keyof LayoutPatterns, Matcher>;

export function compilePatterns(p: LayoutPatterns): CompiledPatterns {
  const out = {} as CompiledPatterns;
  for (const k of PATTERN_KEYS) out[k] = new Matcher(p[k]);
  return out;
}
