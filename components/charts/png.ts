import type { LegendItem } from './chart-frame';
import type { EChartsType } from './echarts-core';
import type { ChartTheme } from './use-chart-theme';

const SCALE = 2;

function loadImage(src: string): Promise<HTMLImageElement> {
  return new Promise((resolve, reject) => {
    const img = new Image();
    img.onload = () => resolve(img);
    img.onerror = () => reject(new Error('The chart image could not be read.'));
    img.src = src;
  });
}

function drawSymbol(ctx: CanvasRenderingContext2D, shape: string, x: number, y: number, r: number, colour: string, paper: string) {
  ctx.beginPath();
  if (shape.endsWith('ircle')) ctx.arc(x, y, r, 0, Math.PI * 2);
  else if (shape.endsWith('ect')) ctx.rect(x - r, y - r, r * 2, r * 2);
  else if (shape.endsWith('riangle')) {
    ctx.moveTo(x, y - r);
    ctx.lineTo(x + r, y + r);
    ctx.lineTo(x - r, y + r);
    ctx.closePath();
  } else {
    ctx.moveTo(x, y - r);
    ctx.lineTo(x + r, y);
    ctx.lineTo(x, y + r);
    ctx.lineTo(x - r, y);
    ctx.closePath();
  }
  if (shape.startsWith('empty')) {
    ctx.fillStyle = paper;
    ctx.fill();
    ctx.lineWidth = 1.3 * SCALE;
    ctx.setLineDash([]);
    ctx.strokeStyle = colour;
    ctx.stroke();
  } else {
    ctx.fillStyle = colour;
    ctx.fill();
  }
}

/**
 * The chart as a PNG that stands on its own once shared: the title and the series key
 * (which live in HTML on the page) are drawn above the plot, on the paper colour of
 * the current view.
 */
export async function chartToPng(
  chart: EChartsType,
  title: string,
  legend: readonly LegendItem[],
  theme: ChartTheme,
): Promise<string> {
  const plotUrl = chart.getDataURL({
    type: 'png',
    pixelRatio: SCALE,
    backgroundColor: theme.paper,
    excludeComponents: ['dataZoom', 'toolbox'],
  });
  const plot = await loadImage(plotUrl);
  const width = plot.width;
  const pad = 12 * SCALE;
  const titleSize = 14 * SCALE;
  const legendSize = 11 * SCALE;
  const rowHeight = 18 * SCALE;

  // Lay out legend rows first so the canvas height is known.
  const measure = document.createElement('canvas').getContext('2d');
  if (!measure) return plotUrl;
  measure.font = `${legendSize}px ${theme.fontText}`;
  const visible = legend.filter((item) => !item.hidden);
  const placed: { item: LegendItem; x: number; row: number }[] = [];
  let x = pad;
  let row = 0;
  for (const item of visible) {
    const w = 34 * SCALE + measure.measureText(item.name).width + 14 * SCALE;
    if (x + w > width - pad && x > pad) {
      row++;
      x = pad;
    }
    placed.push({ item, x, row });
    x += w;
  }
  const legendHeight = visible.length ? (row + 1) * rowHeight : 0;
  const header = pad + titleSize + 8 * SCALE + legendHeight;

  const canvas = document.createElement('canvas');
  canvas.width = width;
  canvas.height = header + plot.height;
  const ctx = canvas.getContext('2d');
  if (!ctx) return plotUrl;
  ctx.fillStyle = theme.paper;
  ctx.fillRect(0, 0, canvas.width, canvas.height);
  ctx.fillStyle = theme.text;
  ctx.textBaseline = 'top';
  ctx.font = `600 ${titleSize}px ${theme.fontText}`;
  ctx.fillText(title, pad, pad, width - pad * 2);

  ctx.font = `${legendSize}px ${theme.fontText}`;
  ctx.textBaseline = 'middle';
  const top = pad + titleSize + 8 * SCALE;
  for (const { item, x: lx, row: r } of placed) {
    const cy = top + r * rowHeight + rowHeight / 2;
    if (item.block) {
      ctx.fillStyle = item.color;
      if (item.block === 'hatched') {
        ctx.strokeStyle = item.color;
        ctx.lineWidth = SCALE;
        ctx.setLineDash([]);
        ctx.strokeRect(lx + 8 * SCALE, cy - 5 * SCALE, 14 * SCALE, 10 * SCALE);
        for (let k = 0; k < 14; k += 4) {
          ctx.beginPath();
          ctx.moveTo(lx + (8 + k) * SCALE, cy + 5 * SCALE);
          ctx.lineTo(lx + (8 + Math.min(k + 4, 14)) * SCALE, cy - 5 * SCALE);
          ctx.stroke();
        }
      } else ctx.fillRect(lx + 8 * SCALE, cy - 5 * SCALE, 14 * SCALE, 10 * SCALE);
    } else {
      ctx.strokeStyle = item.color;
      ctx.lineWidth = item.width * SCALE;
      ctx.setLineDash(item.dash === 'solid' ? [] : item.dash.map((d) => d * SCALE));
      ctx.beginPath();
      ctx.moveTo(lx, cy);
      ctx.lineTo(lx + 28 * SCALE, cy);
      ctx.stroke();
      if (item.symbol) drawSymbol(ctx, item.symbol, lx + 14 * SCALE, cy, 3.5 * SCALE, item.color, theme.paper);
    }
    ctx.fillStyle = theme.text;
    ctx.fillText(item.name, lx + 34 * SCALE, cy);
  }
  ctx.drawImage(plot, 0, header);
  return canvas.toDataURL('image/png');
}
