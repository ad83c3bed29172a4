/**
 * The scrap commodity of a make table, proposed when none is given (rule scrap-proposal;
 * fixture: the 1997 U.S. make table, where S004 'Scrap, used and secondhand goods' is made by many
 * industries as a by-product and is the main product of none). By its label first (scrap, used or
 * second-hand goods), else by structure: the commodity made by the most industries among those
 * that are the main product (the largest entry of the industry's row) of no industry, when at
 * least three industries, and a tenth of them, make it. Agencies take scrap out of market shares
 * (its output would otherwise be read as a demand for the industries that make it).
 */
import type { Axis } from '../../../engine/table';

export interface ScrapProposal {
  code: string;
  rule: 'label' | 'structure';
  why: string;
}

export function proposeScrap(commodities: Axis, make: Float64Array, industries: number): ScrapProposal | undefined {
  const nc = commodities.codes.length;
  const byLabel = commodities.labels?.findIndex((l, c) => l !== commodities.codes[c] && /\bscrap\b|second-?hand|\bused (and second-?hand )?goods\b/i.test(l)) ?? -1;
  if (byLabel >= 0) {
    return { code: commodities.codes[byLabel]!, rule: 'label', why: `its title '${commodities.labels![byLabel]}' names scrap or used goods` };
  }
  const makers = new Int32Array(nc);
  const main = new Uint8Array(nc);
  for (let i = 0; i < industries; i++) {
    let best = -1;
    let bestV = 0;
    for (let c = 0; c < nc; c++) {
      const v = make[i * nc + c]!;
      if (v > 0) makers[c]++;
      if (v > bestV) [best, bestV] = [c, v];
    }
    if (best >= 0) main[best] = 1;
  }
  let pick = -1;
  for (let c = 0; c < nc; c++) if (!main[c] && makers[c]! >= 3 && makers[c]! >= industries * 0.1 && (pick < 0 || makers[c]! > makers[pick]!)) pick = c;
  if (pick < 0) return undefined;
  return { code: commodities.codes[pick]!, rule: 'structure', why: `${makers[pick]} of the ${industries} industries make it, and it is the main product of none` };
}
