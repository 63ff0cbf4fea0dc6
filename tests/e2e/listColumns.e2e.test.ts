import { describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { useBrowser, openPage, signInThroughForm } from '../helpers/browser';

/** A cell's box in page coordinates, with the text it shows (for the failure message). */
interface CellBox {
  text: string;
  left: number;
  right: number;
  top: number;
  bottom: number;
}

/** What the table's layout looks like in the browser: sideways overflow of its body, overlaps with the Actions cells, cut cells. */
interface TableLayout {
  rows: number;
  actionsCells: number;
  scrollWidth: number;
  clientWidth: number;
  overlaps: string[];
  actionsOutside: string[];
  /** Cells whose content is wider than the cell (cut off or ellipsised instead of wrapping). */
  cut: string[];
}

/**
 * Measures a table: each body row's Actions cell (the last header's column, pinned copy included when Element Plus
 * renders one) against every other visible cell of the same row, and the body's sideways overflow.
 */
async function measureTable(page: Page, tableSelector: string): Promise<TableLayout> {
  return page.$eval(tableSelector, (table) => {
    const box = (el: Element) => {
      const r = el.getBoundingClientRect();
      return { text: (el.textContent ?? '').trim().slice(0, 40), left: r.left, right: r.right, top: r.top, bottom: r.bottom };
    };
    const headers = [...table.querySelectorAll('.el-table__header-wrapper th.el-table__cell')];
    const actionsIndex = headers.findIndex((th) => /actions/i.test(th.textContent ?? ''));
    const body = table.querySelector('.el-table__body-wrapper .el-scrollbar__wrap') ?? table.querySelector('.el-table__body-wrapper')!;
    const visible = body.getBoundingClientRect();
    const rows = [...table.querySelectorAll('.el-table__body-wrapper tr.el-table__row')];
    const overlaps: string[] = [];
    const actionsOutside: string[] = [];
    const cut: string[] = [];
    let actionsCells = 0;
    for (const row of rows) {
      const cells = [...row.querySelectorAll(':scope > td.el-table__cell')];
      for (const inner of cells.map((cell) => cell.querySelector('.cell')))
        if (inner && inner.scrollWidth > inner.clientWidth + 1)
          cut.push(`"${(inner.textContent ?? '').trim().slice(0, 40)}" needs ${inner.scrollWidth} px of ${inner.clientWidth}`);
      const actions = cells[actionsIndex];
      if (!actions) continue;
      actionsCells++;
      const a: CellBox = box(actions);
      if (a.left < visible.left - 0.5 || a.right > visible.right + 0.5)
        actionsOutside.push(`${a.left}–${a.right} outside ${visible.left}–${visible.right}`);
      cells.forEach((cell, i) => {
        if (i === actionsIndex) return;
        const c: CellBox = box(cell);
        // Touching edges are fine; a shared strip of more than half a pixel means one covers the other.
        const shared = Math.min(a.right, c.right) - Math.max(a.left, c.left);
        if (shared > 0.5)
          overlaps.push(
            `"${c.text}" (${c.left.toFixed(0)}–${c.right.toFixed(0)}) under Actions (${a.left.toFixed(0)}–${a.right.toFixed(0)})`,
          );
      });
    }
    return { rows: rows.length, actionsCells, scrollWidth: body.scrollWidth, clientWidth: body.clientWidth, overlaps, actionsOutside, cut };
  });
}

/**
 * Every row has its Actions cell (tables that have one), no cell lies under it or is cut off, and the table does not
 * scroll sideways.
 */
function expectEveryCellInView(layout: Awaited<ReturnType<typeof measureTable>>, hasActions = true): void {
  expect(layout.rows).toBeGreaterThan(0);
  expect(layout.actionsCells).toBe(hasActions ? layout.rows : 0);
  expect(layout.overlaps).toEqual([]);
  expect(layout.actionsOutside).toEqual([]);
  expect(layout.cut).toEqual([]);
  expect(layout.scrollWidth).toBeLessThanOrEqual(layout.clientWidth);
}

describe('List columns at 1280 px', () => {
  const baseURL = inject('baseUrl');
  const browser = useBrowser();

  it('when the Designs list is shown 1280 px wide, then no cell lies under the Actions column and the table does not scroll sideways', async () => {
    // Arrange
    const { page, context, pageErrors } = await openPage(browser(), { baseURL, width: 1280 });
    await page.goto('/sign-in');
    await signInThroughForm(page, 'designer@example.test');
    // Act
    await page.goto('/designs');
    await page.waitForSelector('[data-test="designs-table"] [data-test="design-row"]');
    const layout = await measureTable(page, '[data-test="designs-table"]');
    // Assert
    expectEveryCellInView(layout);
    expect(pageErrors).toEqual([]);
    await context.close();
  });

  it.each(['belts', 'pulleys', 'motors'])(
    'when the Parts shelf of %s is shown to an admin 1280 px wide, then no cell lies under the Actions column and the table does not scroll sideways',
    async (shelf) => {
      // Arrange
      const { page, context, pageErrors } = await openPage(browser(), { baseURL, width: 1280 });
      await page.goto('/sign-in');
      await signInThroughForm(page, 'admin@example.test');
      // Act
      await page.goto(`/parts?shelf=${shelf}`);
      await page.waitForSelector(`[data-test="parts-table-${shelf}"] [data-test="part-row"]`);
      const layout = await measureTable(page, `[data-test="parts-table-${shelf}"]`);
      // Assert
      expectEveryCellInView(layout);
      expect(pageErrors).toEqual([]);
      await context.close();
    },
  );

  it.each([
    {
      page: 'Review desk',
      path: '/review',
      who: 'reviewer@example.test',
      table: 'review-desk-table',
      row: 'review-desk-row',
      hasActions: false,
    },
    { page: 'Sheets list', path: '/sheets', who: 'reviewer@example.test', table: 'sheets-table', row: 'sheet-row', hasActions: false },
    { page: 'Team list', path: '/team', who: 'admin@example.test', table: 'team-table', row: 'team-row', hasActions: true },
  ])('when the $page is shown 1280 px wide, then no cell is cut off and the table does not scroll sideways', async (list) => {
    // Arrange
    const { page, context, pageErrors } = await openPage(browser(), { baseURL, width: 1280 });
    await page.goto('/sign-in');
    await signInThroughForm(page, list.who);
    // Act
    await page.goto(list.path);
    await page.waitForSelector(`[data-test="${list.table}"] [data-test="${list.row}"]`);
    const layout = await measureTable(page, `[data-test="${list.table}"]`);
    // Assert
    expectEveryCellInView(layout, list.hasActions);
    expect(pageErrors).toEqual([]);
    await context.close();
  });
});
