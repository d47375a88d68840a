'use client';

import { useId, type ReactNode } from 'react';
import type { Dash, SymbolShape } from './colour';

export interface ChartFrameProps {
  title: string;
  /** The text summary readers get instead of (or beside) the drawing; rendered as the figcaption. */
  summary?: ReactNode;
  /** The drawing. */
  children: ReactNode;
  /** Buttons under the drawing (see ChartActions). */
  actions?: ReactNode;
  /** Series key above the drawing (see ChartLegend). */
  legend?: ReactNode;
  /** 'side' puts the summary to the right of the chart on wide screens; below it otherwise. */
  summaryPlacement?: 'below' | 'side';
  /** Heading level of the title inside the page outline. */
  titleAs?: 'h2' | 'h3' | 'h4' | 'p';
  /** Lets the drawing point at the caption with aria-describedby. */
  summaryId?: string;
  className?: string;
  id?: string;
}

/** Shared figure: title, legend, drawing, actions and a caption that says in words what the chart shows. */
export function ChartFrame({
  title,
  summary,
  children,
  actions,
  legend,
  summaryPlacement = 'below',
  titleAs: Title = 'h3',
  summaryId,
  className = '',
  id,
}: ChartFrameProps) {
  const fallbackId = useId();
  const titleId = `${fallbackId}-title`;
  const captionId = summaryId ?? `${fallbackId}-summary`;
  const side = summaryPlacement === 'side';
  return (
    <figure
      id={id}
      aria-labelledby={titleId}
      className={`min-w-0 rounded-card border border-rule bg-panel p-3 sm:p-4 ${className}`}
    >
      <Title id={titleId} className="text-sm font-semibold leading-snug text-ink">
        {title}
      </Title>
      <div className={side ? 'mt-2 gap-5 lg:grid lg:grid-cols-[minmax(0,1fr)_17rem]' : 'mt-2'}>
        <div className="min-w-0">
          {legend}
          {children}
          {actions}
        </div>
        {summary != null && summary !== '' ? (
          <figcaption
            id={captionId}
            className={`text-sm leading-relaxed text-muted [font-variant-numeric:tabular-nums] ${side ? 'mt-3 border-t border-rule pt-3 lg:mt-0 lg:border-t-0 lg:border-l lg:pl-4 lg:pt-0' : 'mt-3 border-t border-rule pt-3'}`}
          >
            {summary}
          </figcaption>
        ) : null}
      </div>
    </figure>
  );
}

export interface ChartActionsProps {
  onPng?: () => void;
  onCsv?: () => void;
  /** Shown when the chart can zoom: returns to the whole range. */
  onResetZoom?: () => void;
  /** Drag a box across the plot to zoom into it (off by default so touch scrolling keeps working). */
  dragZoom?: { active: boolean; onToggle: () => void };
  /** Extra controls of a particular chart. */
  children?: ReactNode;
}

const BUTTON =
  'inline-flex items-center gap-1.5 rounded-card border border-rule bg-panel px-2 py-1 text-xs text-ink hover:border-accent hover:text-accent aria-pressed:border-accent aria-pressed:text-accent';

export function ChartActions({ onPng, onCsv, onResetZoom, dragZoom, children }: ChartActionsProps) {
  return (
    <div className="mt-2 flex flex-wrap items-center gap-2" role="group" aria-label="Chart actions">
      {dragZoom ? (
        <button type="button" className={BUTTON} aria-pressed={dragZoom.active} onClick={dragZoom.onToggle}>
          <Icon d="M2 2h4M2 2v4M14 14h-4M14 14v-4M10 2h4v4M2 10v4h4" />
          Zoom by box
        </button>
      ) : null}
      {onResetZoom ? (
        <button type="button" className={BUTTON} onClick={onResetZoom}>
          <Icon d="M3 8a5 5 0 1 0 1.5-3.5M3 3v2.5h2.5" />
          Whole range
        </button>
      ) : null}
      {children}
      <span className="ml-auto flex flex-wrap gap-2">
        {onPng ? (
          <button type="button" className={BUTTON} onClick={onPng}>
            <Icon d="M8 2v8M4.5 6.5 8 10l3.5-3.5M2.5 13.5h11" />
            Download PNG
          </button>
        ) : null}
        {onCsv ? (
          <button type="button" className={BUTTON} onClick={onCsv}>
            <Icon d="M8 2v8M4.5 6.5 8 10l3.5-3.5M2.5 13.5h11" />
            Download CSV
          </button>
        ) : null}
      </span>
    </div>
  );
}

function Icon({ d }: { d: string }) {
  return (
    <svg width="12" height="12" viewBox="0 0 16 16" aria-hidden="true" className="shrink-0">
      <path d={d} fill="none" stroke="currentColor" strokeWidth="1.6" strokeLinecap="round" strokeLinejoin="round" />
    </svg>
  );
}

export interface LegendItem {
  key: string;
  name: string;
  color: string;
  dash: Dash;
  width: number;
  symbol?: SymbolShape;
  /** Draws a filled block (bars) rather than a line. */
  block?: 'solid' | 'hatched';
  hidden?: boolean;
}

export interface ChartLegendProps {
  items: readonly LegendItem[];
  /** When given, each item is a toggle button that shows or hides its series. */
  onToggle?: (key: string) => void;
}

/**
 * The series key in HTML rather than on the canvas: it wraps at any width, reads with a
 * screen reader, and its toggles are reachable from the keyboard.
 */
export function ChartLegend({ items, onToggle }: ChartLegendProps) {
  if (items.length === 0) return null;
  return (
    <ul className="mb-2 flex flex-wrap gap-x-3 gap-y-1 text-xs" aria-label="Series">
      {items.map((item) => {
        const body = (
          <>
            <LegendSwatch item={item} />
            <span className={item.hidden ? 'text-muted line-through' : 'text-ink'}>{item.name}</span>
          </>
        );
        return (
          <li key={item.key}>
            {onToggle ? (
              <button
                type="button"
                aria-pressed={!item.hidden}
                title={item.hidden ? `Show ${item.name}` : `Hide ${item.name}`}
                onClick={() => onToggle(item.key)}
                className="inline-flex items-center gap-1.5 rounded-card px-1 py-0.5 hover:bg-paper"
              >
                {body}
              </button>
            ) : (
              <span className="inline-flex items-center gap-1.5 px-1 py-0.5">{body}</span>
            )}
          </li>
        );
      })}
    </ul>
  );
}

export function LegendSwatch({ item }: { item: LegendItem }) {
  const opacity = item.hidden ? 0.35 : 1;
  if (item.block) {
    return (
      <svg width="16" height="12" viewBox="0 0 16 12" aria-hidden="true" className="shrink-0" opacity={opacity}>
        {item.block === 'hatched' ? (
          <>
            <defs>
              <pattern id={`hatch-${item.key}`} width="4" height="4" patternUnits="userSpaceOnUse" patternTransform="rotate(45)">
                <rect width="2" height="4" fill={item.color} />
              </pattern>
            </defs>
            <rect x="1" y="1" width="14" height="10" fill={`url(#hatch-${item.key})`} stroke={item.color} strokeWidth="1" />
          </>
        ) : (
          <rect x="1" y="1" width="14" height="10" fill={item.color} />
        )}
      </svg>
    );
  }
  return (
    <svg width="30" height="12" viewBox="0 0 30 12" aria-hidden="true" className="shrink-0" opacity={opacity}>
      <line
        x1="1"
        x2="29"
        y1="6"
        y2="6"
        stroke={item.color}
        strokeWidth={item.width}
        strokeDasharray={item.dash === 'solid' ? undefined : item.dash.join(' ')}
      />
      {item.symbol ? <SymbolMark shape={item.symbol} x={15} y={6} size={7} color={item.color} /> : null}
    </svg>
  );
}

/** SVG twin of the ECharts marker shapes, for legends outside the canvas. */
export function SymbolMark({ shape, x, y, size, color }: { shape: SymbolShape; x: number; y: number; size: number; color: string }) {
  const r = size / 2;
  const empty = shape.startsWith('empty');
  const paint = empty ? { fill: 'rgb(var(--c-panel))', stroke: color, strokeWidth: 1.3 } : { fill: color };
  switch (shape) {
    case 'circle':
    case 'emptyCircle':
      return <circle cx={x} cy={y} r={r} {...paint} />;
    case 'rect':
    case 'emptyRect':
      return <rect x={x - r} y={y - r} width={size} height={size} {...paint} />;
    case 'triangle':
    case 'emptyTriangle':
      return <path d={`M${x} ${y - r}L${x + r} ${y + r}L${x - r} ${y + r}Z`} {...paint} />;
    default:
      return <path d={`M${x} ${y - r}L${x + r} ${y}L${x} ${y + r}L${x - r} ${y}Z`} {...paint} />;
  }
}
