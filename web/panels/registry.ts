/**
 * Which panel shows each step. Panels are registered here so that areas of the workbench can be
 * added independently; App.svelte shows the steps that have a panel.
 */
import type { Component } from 'svelte';
import type { Step } from '../lib/state.svelte';
import OpenPanel from './OpenPanel.svelte';
import ChecksPanel from './ChecksPanel.svelte';
import MultipliersPanel from './MultipliersPanel.svelte';
import CoefficientsPanel from './CoefficientsPanel.svelte';
import LinkagesPanel from './LinkagesPanel.svelte';
import ScenariosPanel from './ScenariosPanel.svelte';
import ResultsPanel from './ResultsPanel.svelte';
import SensitivityPanel from './SensitivityPanel.svelte';
import LayoutPanel from './LayoutPanel.svelte';
import ReportPanel from './ReportPanel.svelte';
import ProjectsPanel from './ProjectsPanel.svelte';
import EditPanel from './EditPanel.svelte';
import LeontiefPanel from './LeontiefPanel.svelte';
import ComparePanel from './ComparePanel.svelte';
import RegionalisePanel from './RegionalisePanel.svelte';
import BalancePanel from './BalancePanel.svelte';

export const panels: Partial<Record<Step, Component>> = {
  open: OpenPanel,
  layout: LayoutPanel,
  checks: ChecksPanel,
  multipliers: MultipliersPanel,
  coefficients: CoefficientsPanel,
  linkages: LinkagesPanel,
  scenarios: ScenariosPanel,
  results: ResultsPanel,
  sensitivity: SensitivityPanel,
  report: ReportPanel,
  projects: ProjectsPanel,
  edit: EditPanel,
  inverse: LeontiefPanel,
  compare: ComparePanel,
  regional: RegionalisePanel,
  balance: BalancePanel,
};
