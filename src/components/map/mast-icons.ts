// Bearline's mast mark, drawn in the browser: a hub for the structure with one
// spoke and dot per operator present. Each operator keeps a fixed clock
// position (by its order in the operator list) as well as its admin-set
// colour, so the mark reads without relying on colour alone.

import { MAST_STATUSES, type MastStatus } from '../../lib/domain/mast-lists';

export interface OperatorMark {
  id: string;
  name: string;
  colour: string;
}

/** Icon size in CSS pixels (square) and the resolution it is drawn at. */
export const MAST_ICON_SIZE = 40;
export const MAST_ICON_PIXEL_RATIO = 2;

const INK = '#1f3043';
const INK_SOFT = '#476785';
const GREY = '#8d99a6';
const GREY_DARK = '#55616e';
const WHITE = '#ffffff';
const EMBER = '#b46d10';
const EMBER_PALE = '#fdebc8';
const UNKNOWN_OPERATOR = '#97aec4';

const PREFIX = 'mast';
const SIGHTING_ICON = 'sighting-pending';

/** Image id for a mast of this status with these operators ("1,3"). */
export function mastIconId(status: MastStatus, opIds: string): string {
  return `${PREFIX}|${status}|${opIds}`;
}

/** The image id expression used by the mast symbol layer. */
export const MAST_ICON_EXPRESSION = [
  'concat',
  `${PREFIX}|`,
  ['coalesce', ['get', 'status'], 'active'],
  '|',
  ['coalesce', ['to-string', ['get', 'op_ids']], ''],
] as const;

export function isMastIconId(id: string): boolean {
  return id.startsWith(`${PREFIX}|`);
}

export function parseMastIconId(id: string): { status: MastStatus; opIds: string[] } | null {
  const [prefix, status, ops = ''] = id.split('|');
  if (prefix !== PREFIX || !MAST_STATUSES.includes(status as MastStatus)) return null;
  return {
    status: status as MastStatus,
    opIds: ops
      .split(',')
      .map((s) => s.trim())
      .filter(Boolean),
  };
}

export const SIGHTING_ICON_ID = SIGHTING_ICON;

interface Dot {
  angle: number;
  colour: string;
}

/** Dots for the given operator ids, at their operator's fixed clock position. */
export function operatorDots(opIds: readonly string[], operators: readonly OperatorMark[]): Dot[] {
  const slotOf = new Map(operators.map((o, i) => [o.id, i]));
  let extra = operators.length;
  const placed = opIds.map((id) => {
    const slot = slotOf.get(id);
    return slot === undefined ? { slot: extra++, colour: UNKNOWN_OPERATOR } : { slot, colour: operators[slot].colour };
  });
  const slots = Math.max(extra, 1);
  return placed.map((p) => ({ angle: -Math.PI / 2 + (p.slot * 2 * Math.PI) / slots, colour: p.colour }));
}

function createCanvas(size: number): HTMLCanvasElement {
  const canvas = document.createElement('canvas');
  canvas.width = size;
  canvas.height = size;
  return canvas;
}

function circle(ctx: CanvasRenderingContext2D, x: number, y: number, r: number) {
  ctx.beginPath();
  ctx.arc(x, y, r, 0, Math.PI * 2);
}

/** Draws the mast mark onto a 2D context whose unit is one CSS pixel. */
export function paintMastMark(
  ctx: CanvasRenderingContext2D,
  status: MastStatus,
  opIds: readonly string[],
  operators: readonly OperatorMark[],
  size = MAST_ICON_SIZE,
) {
  const c = size / 2;
  const orbit = 11.5;
  const hubR = 5.8;
  const dotR = opIds.length > 4 ? 4 : 5.2;
  const dots = operatorDots(opIds, operators);
  const gone = status === 'decommissioned';
  const planned = status === 'planned';

  ctx.save();
  ctx.globalAlpha = gone ? 0.78 : 1;

  // A soft paper disc keeps the mark legible over roads and woods.
  circle(ctx, c, c, orbit + dotR + 1.4);
  ctx.fillStyle = gone ? 'rgba(255,255,255,0.5)' : 'rgba(255,255,255,0.8)';
  ctx.fill();
  if (!planned) {
    ctx.lineWidth = 0.8;
    ctx.strokeStyle = 'rgba(31,48,67,0.25)';
    ctx.stroke();
  }

  if (planned) {
    circle(ctx, c, c, orbit + dotR + 1.2);
    ctx.setLineDash([3, 2.2]);
    ctx.lineWidth = 1.4;
    ctx.strokeStyle = INK_SOFT;
    ctx.stroke();
    ctx.setLineDash([]);
  }

  // Spokes from the hub to each operator's dot.
  ctx.lineCap = 'round';
  for (const d of dots) {
    ctx.beginPath();
    ctx.moveTo(c, c);
    ctx.lineTo(c + Math.cos(d.angle) * orbit, c + Math.sin(d.angle) * orbit);
    ctx.lineWidth = 1.8;
    ctx.strokeStyle = gone ? GREY : INK;
    if (planned) ctx.setLineDash([1.6, 1.6]);
    ctx.stroke();
    ctx.setLineDash([]);
  }

  // Operator dots: filled when active, rings when planned, grey when gone.
  for (const d of dots) {
    const x = c + Math.cos(d.angle) * orbit;
    const y = c + Math.sin(d.angle) * orbit;
    circle(ctx, x, y, dotR);
    if (gone) {
      ctx.fillStyle = '#e6e9ec';
      ctx.fill();
      ctx.lineWidth = 1.2;
      ctx.strokeStyle = GREY;
      ctx.stroke();
    } else if (planned) {
      ctx.fillStyle = WHITE;
      ctx.fill();
      ctx.lineWidth = 2;
      ctx.strokeStyle = d.colour;
      ctx.stroke();
    } else {
      ctx.fillStyle = d.colour;
      ctx.fill();
      ctx.lineWidth = 1.3;
      ctx.strokeStyle = WHITE;
      ctx.stroke();
    }
  }

  // The hub: the structure itself.
  circle(ctx, c, c, hubR);
  ctx.fillStyle = gone ? '#c9d0d7' : planned ? WHITE : INK;
  ctx.fill();
  ctx.lineWidth = planned ? 1.8 : 1.4;
  ctx.strokeStyle = gone ? GREY_DARK : planned ? INK : WHITE;
  ctx.stroke();

  if (gone) {
    const k = hubR + 3.2;
    ctx.beginPath();
    ctx.moveTo(c - k, c - k);
    ctx.lineTo(c + k, c + k);
    ctx.moveTo(c + k, c - k);
    ctx.lineTo(c - k, c + k);
    ctx.lineWidth = 1.8;
    ctx.strokeStyle = GREY_DARK;
    ctx.globalAlpha = 1;
    ctx.stroke();
  }
  ctx.restore();
}

/** Draws the mark reserved for pending sightings: a dashed amber diamond. */
export function paintSightingMark(ctx: CanvasRenderingContext2D, size = MAST_ICON_SIZE) {
  const c = size / 2;
  const r = 11;
  ctx.save();
  ctx.beginPath();
  ctx.moveTo(c, c - r);
  ctx.lineTo(c + r, c);
  ctx.lineTo(c, c + r);
  ctx.lineTo(c - r, c);
  ctx.closePath();
  ctx.fillStyle = EMBER_PALE;
  ctx.fill();
  ctx.setLineDash([2.6, 1.8]);
  ctx.lineWidth = 1.8;
  ctx.strokeStyle = EMBER;
  ctx.stroke();
  ctx.setLineDash([]);
  circle(ctx, c, c, 2.4);
  ctx.fillStyle = EMBER;
  ctx.fill();
  ctx.restore();
}

function render(paint: (ctx: CanvasRenderingContext2D) => void, ratio = MAST_ICON_PIXEL_RATIO): HTMLCanvasElement {
  const canvas = createCanvas(MAST_ICON_SIZE * ratio);
  const ctx = canvas.getContext('2d')!;
  ctx.scale(ratio, ratio);
  paint(ctx);
  return canvas;
}

/** Pixel data for MapLibre's addImage (drawn at MAST_ICON_PIXEL_RATIO). */
export function mastIconImage(id: string, operators: readonly OperatorMark[]): ImageData | null {
  if (id === SIGHTING_ICON) return toImageData(render((ctx) => paintSightingMark(ctx)));
  const parsed = parseMastIconId(id);
  if (!parsed) return null;
  return toImageData(render((ctx) => paintMastMark(ctx, parsed.status, parsed.opIds, operators)));
}

function toImageData(canvas: HTMLCanvasElement): ImageData {
  return canvas.getContext('2d')!.getImageData(0, 0, canvas.width, canvas.height);
}

/** A data URL of the mark, for the legend and the panel. */
export function mastIconDataUrl(status: MastStatus, opIds: readonly string[], operators: readonly OperatorMark[]): string {
  return render((ctx) => paintMastMark(ctx, status, opIds, operators)).toDataURL('image/png');
}

export function sightingIconDataUrl(): string {
  return render((ctx) => paintSightingMark(ctx)).toDataURL('image/png');
}
