/**
 * The report settings that state a household closure and the rounds split, shared by the command
 * line (`prepareModels`) and the workbench's report (web/worker/ops/report.ts), so that both
 * name the closure basis, the household income divided by, the share and the implied spending
 * share in the same words.
 */
import type { HouseholdClosure } from '../../engine/household';
import { CLOSURE_BASIS_ABOUT } from '../../engine/household';
import type { ReportSetting } from './model';
import { setting } from './model';

/**
 * The settings of a closure in use: its basis (given or the default), the household income
 * (basis household-income), the share of income spent (basis propensity), households' own
 * purchases when any, and the implied spending share with how it was found.
 */
export function closureSettings(c: HouseholdClosure, options: { basisGiven: boolean; propensity?: number | undefined }): ReportSetting[] {
  const out: ReportSetting[] = [setting('householdBasis', 'Closure basis (what household spending is divided by)', c.basis, options.basisGiven ? 'given' : 'default', CLOSURE_BASIS_ABOUT[c.basis])];
  if (c.basis === 'household-income') out.push(setting('householdIncome', 'Household income divided by', c.denominator, 'given'));
  if (c.basis === 'propensity') out.push(setting('propensity', 'Share of income spent in the economy', options.propensity ?? null, 'given'));
  if (c.ownPurchases) out.push(setting('householdOwnPurchases', "Households' purchases from households", c.ownPurchases, 'given'));
  out.push(setting('spendingShare', "Share of household income spent on the table's products (implied)", c.share, 'default', `(Σ consumption column${c.ownPurchases ? ' + own purchases' : ''}) ÷ ${c.denominator.toPrecision(6)}`));
  return out;
}

/** The setting that says the indirect effect is split into rounds. */
export function roundsSetting(): ReportSetting {
  return setting('split', 'Indirect effect split', 'rounds', 'given', 'First round (c′A) and later rounds (industrial support)');
}
