// Reading the 3D view's pixels back in the page: how much of the canvas is drawn on.
import type { Page } from "playwright-core";

/**
 * Share of canvas pixels that differ clearly from the background, how many colours, and how
 * many of them lie in a band of 4 % along the canvas edges.
 */
export async function canvasInk(page: Page, scope = '[data-testid="truss-viewer"]') {
  return page.evaluate((sel) => {
    const c = document.querySelector<HTMLCanvasElement>(`${sel} canvas`);
    if (!c || c.width === 0) return { ratio: 0, colours: 0, width: 0, border: -1 };
    const off = document.createElement("canvas");
    off.width = c.width;
    off.height = c.height;
    const ctx = off.getContext("2d")!;
    ctx.drawImage(c, 0, 0);
    const d = ctx.getImageData(0, 0, c.width, c.height).data;
    const bg = [d[0]!, d[1]!, d[2]!];
    const bx = Math.ceil(c.width * 0.04);
    const by = Math.ceil(c.height * 0.04);
    let ink = 0;
    let border = 0;
    const colours = new Set<number>();
    for (let i = 0; i < d.length; i += 4) {
      if (Math.abs(d[i]! - bg[0]!) + Math.abs(d[i + 1]! - bg[1]!) + Math.abs(d[i + 2]! - bg[2]!) > 40) {
        ink++;
        colours.add(((d[i]! >> 4) << 8) | ((d[i + 1]! >> 4) << 4) | (d[i + 2]! >> 4));
        const x = (i / 4) % c.width;
        const y = Math.floor(i / 4 / c.width);
        if (x < bx || y < by || x >= c.width - bx || y >= c.height - by) border++;
      }
    }
    return { ratio: ink / (d.length / 4), colours: colours.size, width: c.width, border };
  }, scope);
}

export async function waitForCanvas(page: Page) {
  await page.locator('[data-testid="truss-viewer"] canvas').waitFor({ state: "visible", timeout: 30_000 });
  // frames are drawn on demand; give the first frames a moment
  await page.waitForTimeout(1200);
}
