/**
 * Markup of the Regionalise and Balance panels, rendered to HTML in Node (svelte/server) with the
 * invented demo table current: every control labelled, the five methods by their published names,
 * δ with its default, and the regional cautions beside the general ones.
 */
import { describe, expect, it } from 'vitest';
import { render } from 'svelte/server';
import RegionalisePanel from '../../web/panels/RegionalisePanel.svelte';
import BalancePanel from '../../web/panels/BalancePanel.svelte';
import { app } from '../../web/lib/state.svelte';
import { demoTable } from '../../web/lib/demo';

describe('the Regionalise and Balance panels', () => {
  it('Regionalise: the file or typed values, the five methods, δ = 0.3, the cautions', () => {
    app.table = demoTable;
    const { body } = render(RegionalisePanel);
    expect(body).toMatch(/<input type="file"[^>]*aria-label="Regional file"/);
    for (const m of ['Simple location quotient', 'Cross-industry', "Flegg's location quotient (FLQ)", 'Augmented', 'Supply-demand pool']) expect(body).toContain(m);
    expect(body).toMatch(/aria-label="delta"[^>]*value="0.3"|value="0.3"[^>]*aria-label="delta"/);
    expect(body).toMatch(/overstate regional multipliers/);
    expect(body).toMatch(/survey-based or hybrid/);
    expect(body).toMatch(/qualified economist/);
    expect(body).toContain('Estimate the regional table');
  });

  it('Balance: the part, the method, the totals files, the cells held fixed, the caution', () => {
    app.table = demoTable;
    const { body } = render(BalancePanel);
    for (const l of ['Part to balance', 'Balancing method', 'Row totals file', 'Column totals file', 'Cells held fixed', 'Relative tolerance']) expect(body).toContain(`aria-label="${l}"`);
    expect(body).toMatch(/A balanced table is an estimate/);
    expect(body).toContain('Balance to these totals');
  });
});
