/** The invented demo economy, bundled with the page so that opening it needs no request. */
import demo from '../../data-demo/vellan-coast.table.json';
import type { PlainTable } from '../../engine/index';

export const DEMO_NAME = 'Vellan Coast (invented demo)';
export const demoTable = demo as unknown as PlainTable;
