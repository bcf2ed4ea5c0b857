import {
  layoutMarkup,
  MARKUP_MAX_SHAPES,
  MARKUP_MAX_TEXT,
  markupColourInfo,
  markupColours,
  markupShapeNames,
  type MarkupColour,
  type MarkupShape,
  type MarkupShapeType,
} from '@underfoot/core';
import { createElement, useCallback, useEffect, useId, useRef, useState, type KeyboardEvent, type PointerEvent } from 'react';
import { Button } from '@/components/ui/button';
import { inputClasses } from '@/components/ui/text-field';
import { errorMessage, isApiError } from '@/lib/api-client';
import { cn } from '@/lib/cn';
import type { MediaView } from '../api';
import { newId } from '../model/document';
import { FieldError } from '@/components/ui/field-error';

type Tool = 'select' | MarkupShapeType;
type Point = { x: number; y: number };

const clamp = (v: number, lo = 0, hi = 1) => Math.min(hi, Math.max(lo, v));
const round4 = (v: number) => Math.round(v * 10_000) / 10_000;

/** The box a shape covers, in fractions of the picture. */
function boundsOf(shape: MarkupShape, aspect: number): { x: number; y: number; w: number; h: number } {
  if (shape.type === 'arrow') {
    const x = Math.min(shape.x1, shape.x2);
    const y = Math.min(shape.y1, shape.y2);
    return { x, y, w: Math.abs(shape.x2 - shape.x1), h: Math.abs(shape.y2 - shape.y1) };
  }
  if (shape.type === 'text') {
    // Label size follows core's metrics: 6 % of the shorter side; width roughly 0.6 em a character.
    const fontH = 0.06 * Math.min(1, aspect);
    const fontW = 0.06 * Math.min(1, 1 / aspect) * 0.6 * shape.text.length;
    return { x: shape.x, y: shape.y, w: Math.min(1 - shape.x, fontW), h: fontH * 1.1 };
  }
  return { x: shape.x, y: shape.y, w: shape.w, h: shape.h };
}

function distanceToSegment(p: Point, a: Point, b: Point) {
  const dx = b.x - a.x;
  const dy = b.y - a.y;
  const length2 = dx * dx + dy * dy;
  const t = length2 === 0 ? 0 : clamp(((p.x - a.x) * dx + (p.y - a.y) * dy) / length2);
  return Math.hypot(p.x - (a.x + t * dx), p.y - (a.y + t * dy));
}

function hit(shape: MarkupShape, p: Point, aspect: number): boolean {
  const tolerance = 0.03;
  if (shape.type === 'arrow') return distanceToSegment(p, { x: shape.x1, y: shape.y1 }, { x: shape.x2, y: shape.y2 }) < tolerance;
  const b = boundsOf(shape, aspect);
  return p.x >= b.x - tolerance && p.x <= b.x + b.w + tolerance && p.y >= b.y - tolerance && p.y <= b.y + b.h + tolerance;
}

/** Move a shape by a delta, keeping it on the picture. */
function moveShape(shape: MarkupShape, dx: number, dy: number, aspect: number): MarkupShape {
  const b = boundsOf(shape, aspect);
  const mx = clamp(dx, -b.x, 1 - (b.x + b.w));
  const my = clamp(dy, -b.y, 1 - (b.y + b.h));
  if (shape.type === 'arrow') {
    return { ...shape, x1: round4(shape.x1 + mx), y1: round4(shape.y1 + my), x2: round4(shape.x2 + mx), y2: round4(shape.y2 + my) };
  }
  return { ...shape, x: round4(shape.x + mx), y: round4(shape.y + my) };
}

/** A shape drawn from one point to another; a tap makes a sensible default size. */
function shapeFrom(type: MarkupShapeType, colour: MarkupColour, a: Point, b: Point, text: string): MarkupShape {
  const id = newId();
  const tiny = Math.abs(b.x - a.x) < 0.02 && Math.abs(b.y - a.y) < 0.02;
  if (type === 'arrow') {
    // A tap points an arrow at the spot from below-right.
    const tail = tiny ? { x: clamp(a.x + 0.15), y: clamp(a.y + 0.15) } : a;
    const head = tiny ? a : b;
    return { id, type, colour, x1: round4(tail.x), y1: round4(tail.y), x2: round4(head.x), y2: round4(head.y) };
  }
  if (type === 'text') return { id, type, colour, x: round4(clamp(a.x, 0, 0.95)), y: round4(clamp(a.y, 0, 0.93)), text };
  const x = tiny ? clamp(a.x - 0.1, 0, 0.8) : Math.min(a.x, b.x);
  const y = tiny ? clamp(a.y - 0.1, 0, 0.8) : Math.min(a.y, b.y);
  const w = tiny ? 0.2 : Math.abs(b.x - a.x);
  const h = tiny ? 0.2 : Math.abs(b.y - a.y);
  return { id, type, colour, x: round4(x), y: round4(y), w: round4(Math.min(w, 1 - x)), h: round4(Math.min(h, 1 - y)) };
}

function describe(shape: MarkupShape, index: number) {
  const colour = markupColourInfo[shape.colour].name;
  return shape.type === 'text'
    ? `${index + 1}. Label “${shape.text}”, ${colour}`
    : `${index + 1}. ${markupShapeNames[shape.type]}, ${colour}`;
}

const toolNames: Record<Tool, string> = { select: 'Move', ...markupShapeNames };

/**
 * Draw on a still: arrows, circles, boxes and short labels in a few colours; move and
 * delete them; undo and redo. Pointer events serve touch, pen and mouse alike; the
 * keyboard can pick a tool, add a mark in the middle, select marks from the list, move
 * them with the arrow keys and delete them. Saved as vector data; the server burns it in.
 */
export function MarkupEditor({
  still,
  readOnly,
  onSave,
  onClose,
  onRemoveStill,
}: {
  still: MediaView;
  readOnly: boolean;
  onSave: (shapes: MarkupShape[]) => Promise<void>;
  onClose: () => void;
  onRemoveStill?: () => void;
}) {
  const width = still.width ?? 1600;
  const height = still.height ?? 1200;
  const aspect = width / height;
  const [shapes, setShapes] = useState<MarkupShape[]>(still.markup?.shapes ?? []);
  const [past, setPast] = useState<MarkupShape[][]>([]);
  const [future, setFuture] = useState<MarkupShape[][]>([]);
  const [tool, setTool] = useState<Tool>('arrow');
  const [colour, setColour] = useState<MarkupColour>('flare');
  const [labelText, setLabelText] = useState('');
  const [selectedId, setSelectedId] = useState<string | null>(null);
  const [saving, setSaving] = useState(false);
  const [message, setMessage] = useState<string | null>(null);
  const svgRef = useRef<SVGSVGElement>(null);
  const drag = useRef<{ mode: 'draw' | 'move'; start: Point; last: Point; before: MarkupShape[]; id: string } | null>(null);
  const labelId = useId();
  const canvasHelpId = useId();
  const dirty = JSON.stringify(shapes) !== JSON.stringify(still.markup?.shapes ?? []);

  const commit = useCallback(
    (next: MarkupShape[], before: MarkupShape[] = shapes) => {
      setPast((p) => [...p.slice(-49), before]);
      setFuture([]);
      setShapes(next);
    },
    [shapes],
  );

  const undo = useCallback(() => {
    const previous = past.at(-1);
    if (!previous) return;
    setFuture([shapes, ...future]);
    setPast(past.slice(0, -1));
    setShapes(previous);
    setSelectedId(null);
  }, [past, future, shapes]);

  const redo = useCallback(() => {
    const next = future[0];
    if (!next) return;
    setPast([...past, shapes]);
    setFuture(future.slice(1));
    setShapes(next);
    setSelectedId(null);
  }, [past, future, shapes]);

  const selected = shapes.find((s) => s.id === selectedId) ?? null;

  function pointOf(event: PointerEvent<SVGSVGElement>): Point {
    const rect = event.currentTarget.getBoundingClientRect();
    return { x: clamp((event.clientX - rect.left) / rect.width), y: clamp((event.clientY - rect.top) / rect.height) };
  }

  function addShape(shape: MarkupShape) {
    if (shapes.length >= MARKUP_MAX_SHAPES) {
      setMessage(`At most ${MARKUP_MAX_SHAPES} marks on one still.`);
      return false;
    }
    commit([...shapes, shape]);
    setSelectedId(shape.id);
    return true;
  }

  function needLabel(): boolean {
    if (labelText.trim() !== '') return false;
    setMessage('Write the label first, then tap where it goes.');
    document.getElementById(labelId)?.focus();
    return true;
  }

  function onPointerDown(event: PointerEvent<SVGSVGElement>) {
    if (readOnly || event.button > 0) return;
    const p = pointOf(event);
    setMessage(null);
    if (tool === 'select') {
      const target = [...shapes].reverse().find((s) => hit(s, p, aspect));
      setSelectedId(target?.id ?? null);
      if (target) {
        event.currentTarget.setPointerCapture(event.pointerId);
        drag.current = { mode: 'move', start: p, last: p, before: shapes, id: target.id };
      }
      return;
    }
    if (tool === 'text') {
      if (needLabel()) return;
      addShape(shapeFrom('text', colour, p, p, labelText.trim()));
      return;
    }
    if (shapes.length >= MARKUP_MAX_SHAPES) {
      setMessage(`At most ${MARKUP_MAX_SHAPES} marks on one still.`);
      return;
    }
    event.currentTarget.setPointerCapture(event.pointerId);
    const shape = shapeFrom(tool, colour, p, p, '');
    drag.current = { mode: 'draw', start: p, last: p, before: shapes, id: shape.id };
    setShapes([...shapes, shape]);
    setSelectedId(shape.id);
  }

  function onPointerMove(event: PointerEvent<SVGSVGElement>) {
    const current = drag.current;
    if (!current) return;
    const p = pointOf(event);
    if (current.mode === 'move') {
      const dx = p.x - current.last.x;
      const dy = p.y - current.last.y;
      current.last = p;
      setShapes((list) => list.map((s) => (s.id === current.id ? moveShape(s, dx, dy, aspect) : s)));
    } else {
      current.last = p;
      const type = tool === 'select' || tool === 'text' ? 'box' : tool;
      setShapes((list) =>
        list.map((s) => (s.id === current.id ? { ...shapeFrom(type, colour, current.start, p, ''), id: current.id } : s)),
      );
    }
  }

  function onPointerUp() {
    const current = drag.current;
    drag.current = null;
    if (!current) return;
    const moved = Math.abs(current.last.x - current.start.x) > 0.001 || Math.abs(current.last.y - current.start.y) > 0.001;
    if (current.mode === 'draw') {
      const type = tool === 'select' || tool === 'text' ? 'box' : tool;
      const finished = { ...shapeFrom(type, colour, current.start, current.last, ''), id: current.id };
      commit([...current.before, finished], current.before);
    } else if (moved) {
      setPast((p) => [...p.slice(-49), current.before]);
      setFuture([]);
    }
  }

  function onCanvasKey(event: KeyboardEvent<SVGSVGElement>) {
    if (readOnly) return;
    const step = event.shiftKey ? 0.05 : 0.01;
    const moves: Record<string, [number, number]> = {
      ArrowLeft: [-step, 0],
      ArrowRight: [step, 0],
      ArrowUp: [0, -step],
      ArrowDown: [0, step],
    };
    const move = moves[event.key];
    if (move && selected) {
      event.preventDefault();
      commit(shapes.map((s) => (s.id === selected.id ? moveShape(s, move[0], move[1], aspect) : s)));
    } else if ((event.key === 'Delete' || event.key === 'Backspace') && selected) {
      event.preventDefault();
      commit(shapes.filter((s) => s.id !== selected.id));
      setSelectedId(null);
    } else if (event.key === 'Escape' && selected) {
      event.preventDefault();
      event.stopPropagation();
      setSelectedId(null);
    } else if (event.key === 'Enter' && tool !== 'select') {
      // A mark in the middle of the picture, to move into place with the arrow keys.
      event.preventDefault();
      if (tool === 'text' && needLabel()) return;
      const centre = { x: 0.5, y: 0.5 };
      addShape(shapeFrom(tool, colour, centre, centre, labelText.trim()));
    }
  }

  // Undo and redo anywhere in the editor.
  useEffect(() => {
    const onKey = (event: globalThis.KeyboardEvent) => {
      if (!(event.ctrlKey || event.metaKey) || readOnly) return;
      const target = event.target as HTMLElement | null;
      if (target && (target.tagName === 'INPUT' || target.tagName === 'TEXTAREA')) return;
      if (event.key.toLowerCase() === 'z' && !event.shiftKey) {
        event.preventDefault();
        undo();
      } else if ((event.key.toLowerCase() === 'z' && event.shiftKey) || event.key.toLowerCase() === 'y') {
        event.preventDefault();
        redo();
      }
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [undo, redo, readOnly]);

  function recolour(next: MarkupColour) {
    setColour(next);
    if (selected && selected.colour !== next) commit(shapes.map((s) => (s.id === selected.id ? { ...s, colour: next } : s)));
  }

  function relabel(text: string) {
    setLabelText(text);
    if (selected?.type === 'text' && text.trim() !== '') {
      setShapes((list) => list.map((s) => (s.id === selected.id && s.type === 'text' ? { ...s, text: text.trim() } : s)));
    }
  }

  async function save() {
    setSaving(true);
    setMessage(null);
    try {
      await onSave(shapes);
    } catch (error) {
      setMessage(
        isApiError(error, 409)
          ? 'Someone else changed the markup on this still. Close and open it again to see theirs.'
          : errorMessage(error),
      );
    } finally {
      setSaving(false);
    }
  }

  const elements = layoutMarkup({ shapes }, { width, height });
  const selectedBounds = selected ? boundsOf(selected, aspect) : null;

  return (
    <div className="space-y-3">
      {!readOnly ? (
        <div className="space-y-2">
          <div role="toolbar" aria-label="Markup tools" className="flex flex-wrap gap-1.5">
            {(['arrow', 'ellipse', 'box', 'text', 'select'] as const).map((t) => (
              <button
                key={t}
                type="button"
                aria-pressed={tool === t}
                onClick={() => {
                  setTool(t);
                  setMessage(null);
                }}
                className={cn(
                  'min-h-10 rounded-lg border px-3 text-sm font-semibold',
                  tool === t ? 'border-accent bg-accent text-white' : 'border-line-strong bg-white hover:bg-sand',
                )}
              >
                {toolNames[t]}
              </button>
            ))}
          </div>
          <div role="radiogroup" aria-label="Colour" className="flex flex-wrap items-center gap-2">
            {markupColours.map((c) => (
              <button
                key={c}
                type="button"
                role="radio"
                aria-checked={colour === c}
                aria-label={markupColourInfo[c].name}
                title={markupColourInfo[c].name}
                onClick={() => recolour(c)}
                className={cn(
                  'size-10 rounded-full border-2',
                  colour === c ? 'border-ink ring-2 ring-accent ring-offset-2' : 'border-line-strong',
                )}
                style={{ backgroundColor: markupColourInfo[c].hex }}
              />
            ))}
            <span className="text-sm text-ink-muted">{markupColourInfo[colour].name}</span>
          </div>
          {tool === 'text' || selected?.type === 'text' ? (
            <div className="space-y-1">
              <label htmlFor={labelId} className="block text-sm font-semibold">
                Label text
              </label>
              <input
                id={labelId}
                className={inputClasses}
                maxLength={MARKUP_MAX_TEXT}
                value={selected?.type === 'text' ? selected.text : labelText}
                placeholder="e.g. Roots at joint"
                onChange={(e) => relabel(e.target.value)}
              />
              <p className="text-xs text-ink-muted">Up to {MARKUP_MAX_TEXT} characters. Then tap the picture where the label goes.</p>
            </div>
          ) : null}
        </div>
      ) : null}

      <div className="relative overflow-hidden rounded-lg bg-black select-none">
        <img
          src={still.url}
          alt={`Still ${still.originalName || ''}`.trim()}
          width={width}
          height={height}
          className="block h-auto w-full"
          draggable={false}
        />
        <svg
          ref={svgRef}
          role="application"
          aria-label="Still to mark up"
          aria-describedby={canvasHelpId}
          tabIndex={0}
          viewBox={`0 0 ${width} ${height}`}
          preserveAspectRatio="none"
          className={cn('absolute inset-0 h-full w-full touch-none', !readOnly && (tool === 'select' ? 'cursor-move' : 'cursor-crosshair'))}
          onPointerDown={onPointerDown}
          onPointerMove={onPointerMove}
          onPointerUp={onPointerUp}
          onPointerCancel={onPointerUp}
          onKeyDown={onCanvasKey}
        >
          {elements.map((el, i) => createElement(el.tag, { key: `${el.shapeId}-${i}`, ...el.attrs }, el.text))}
          {selectedBounds ? (
            <rect
              x={selectedBounds.x * width - 6}
              y={selectedBounds.y * height - 6}
              width={selectedBounds.w * width + 12}
              height={selectedBounds.h * height + 12}
              fill="none"
              stroke="#ffffff"
              strokeWidth={Math.max(1.5, width / 600)}
              strokeDasharray={`${width / 100} ${width / 150}`}
              pointerEvents="none"
            />
          ) : null}
        </svg>
      </div>
      <p id={canvasHelpId} className="text-xs text-ink-muted">
        Drag on the picture to draw; tap for a standard size. With a keyboard: pick a tool, press Enter on the picture to add a mark in the
        middle, move the selected mark with the arrow keys (Shift for bigger steps), Delete removes it, Ctrl+Z undoes.
      </p>

      {shapes.length > 0 ? (
        <div>
          <p className="text-sm font-semibold">Marks</p>
          <ul className="mt-1 flex flex-wrap gap-1.5">
            {shapes.map((s, i) => (
              <li key={s.id}>
                <button
                  type="button"
                  aria-pressed={s.id === selectedId}
                  onClick={() => {
                    setSelectedId(s.id === selectedId ? null : s.id);
                    svgRef.current?.focus();
                  }}
                  className={cn(
                    'inline-flex min-h-9 items-center gap-1.5 rounded-full border px-3 text-sm',
                    s.id === selectedId ? 'border-accent bg-accent-soft font-semibold' : 'border-line bg-white hover:bg-sand',
                  )}
                >
                  <span
                    aria-hidden="true"
                    className="size-3 rounded-full border border-ink/30"
                    style={{ backgroundColor: markupColourInfo[s.colour].hex }}
                  />
                  {describe(s, i)}
                </button>
              </li>
            ))}
          </ul>
        </div>
      ) : (
        <p className="text-sm text-ink-muted">No marks yet.</p>
      )}

      <FieldError message={message ?? undefined} />

      <div className="flex flex-wrap items-center gap-2 border-t border-line pt-3">
        {!readOnly ? (
          <>
            <Button onClick={() => void save()} pending={saving} disabled={!dirty}>
              Save markup
            </Button>
            <Button variant="secondary" size="sm" onClick={undo} disabled={past.length === 0}>
              Undo
            </Button>
            <Button variant="secondary" size="sm" onClick={redo} disabled={future.length === 0}>
              Redo
            </Button>
            <Button
              variant="secondary"
              size="sm"
              disabled={!selected}
              onClick={() => {
                if (!selected) return;
                commit(shapes.filter((s) => s.id !== selected.id));
                setSelectedId(null);
              }}
            >
              Delete mark
            </Button>
          </>
        ) : null}
        <Button variant="quiet" onClick={onClose}>
          {dirty && !readOnly ? 'Close without saving' : 'Done'}
        </Button>
        {onRemoveStill && !readOnly ? (
          <Button variant="quiet" size="sm" className="ml-auto text-danger hover:bg-danger-soft" onClick={onRemoveStill}>
            Remove this still
          </Button>
        ) : null}
      </div>
    </div>
  );
}
