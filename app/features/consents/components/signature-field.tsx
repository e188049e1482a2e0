import { useEffect, useId, useRef, useState, type Ref } from 'react';
import SignaturePad, { type PointGroup } from 'signature_pad';
import { Button } from '../../../components/ui/button.tsx';

interface SignatureFieldProps {
  /** A PNG data URL of what is drawn, or "" while the box is empty. */
  onChange: (value: string) => void;
  error?: string;
  disabled?: boolean;
  /** Receives the box, so a form can move focus to it when the signature is missing. */
  focusRef?: Ref<HTMLFieldSetElement>;
}

// At most 2×: sharp enough on any tablet, and the PNG stays well inside the server's size limit.
const MAX_RATIO = 2;

/** Moves strokes drawn at one size onto a box of another, so turning the tablet keeps the signature whole. */
function scaled(data: PointGroup[], sx: number, sy: number): PointGroup[] {
  if (sx === 1 && sy === 1) return data;
  return data.map((group) => ({ ...group, points: group.points.map((p) => ({ ...p, x: p.x * sx, y: p.y * sy })) }));
}

/**
 * A finger signature on a canvas (signature_pad). The canvas follows its box: sized in CSS, drawn
 * at the screen's pixel ratio, and redrawn, not wiped, when the box changes size.
 */
export function SignatureField({ onChange, error, disabled = false, focusRef }: SignatureFieldProps) {
  const id = useId();
  const hintId = `${id}-hint`;
  const errorId = `${id}-error`;
  const canvasRef = useRef<HTMLCanvasElement>(null);
  const padRef = useRef<SignaturePad | null>(null);
  const [empty, setEmpty] = useState(true);
  const onChangeRef = useRef(onChange);
  useEffect(() => {
    onChangeRef.current = onChange;
  });

  useEffect(() => {
    const canvas = canvasRef.current;
    if (!canvas) return;
    const pad = new SignaturePad(canvas, { penColor: '#2a211c', minWidth: 1.2, maxWidth: 3.6, throttle: 8 });
    padRef.current = pad;
    const emit = () => {
      const isEmpty = pad.isEmpty();
      setEmpty(isEmpty);
      onChangeRef.current(isEmpty ? '' : pad.toDataURL('image/png'));
    };
    pad.addEventListener('endStroke', emit);

    let cssWidth = 0;
    let cssHeight = 0;
    const fit = () => {
      const rect = canvas.getBoundingClientRect();
      if (rect.width === 0 || rect.height === 0) return;
      const ratio = Math.min(Math.max(window.devicePixelRatio || 1, 1), MAX_RATIO);
      const width = Math.round(rect.width * ratio);
      const height = Math.round(rect.height * ratio);
      if (width === canvas.width && height === canvas.height) return;
      const data = pad.toData();
      const sx = cssWidth ? rect.width / cssWidth : 1;
      const sy = cssHeight ? rect.height / cssHeight : 1;
      cssWidth = rect.width;
      cssHeight = rect.height;
      // Setting the size clears the canvas and its transform; the pad draws in CSS pixels on top.
      canvas.width = width;
      canvas.height = height;
      canvas.getContext('2d')?.scale(ratio, ratio);
      if (data.length) pad.fromData(scaled(data, sx, sy));
      else pad.clear();
      if (data.length) emit();
    };
    fit();
    const observer = new ResizeObserver(fit);
    observer.observe(canvas);
    return () => {
      observer.disconnect();
      pad.removeEventListener('endStroke', emit);
      pad.off();
      padRef.current = null;
    };
  }, []);

  useEffect(() => {
    const pad = padRef.current;
    if (!pad) return;
    if (disabled) pad.off();
    else pad.on();
  }, [disabled]);

  function clear() {
    const pad = padRef.current;
    if (!pad) return;
    pad.clear();
    setEmpty(true);
    onChangeRef.current('');
  }

  function undo() {
    const pad = padRef.current;
    if (!pad) return;
    const data = pad.toData();
    data.pop();
    pad.fromData(data);
    const isEmpty = pad.isEmpty();
    setEmpty(isEmpty);
    onChangeRef.current(isEmpty ? '' : pad.toDataURL('image/png'));
  }

  return (
    <fieldset
      ref={focusRef}
      tabIndex={-1}
      aria-describedby={error ? `${hintId} ${errorId}` : hintId}
      className="flex flex-col gap-2"
      data-testid="signature-field"
    >
      <legend className="mb-2 text-xl font-bold text-ink-900">Your signature</legend>
      <p id={hintId} className="text-lg text-ink-700">
        Sign with your finger in the box.
      </p>
      <div className={`relative rounded-xl border-2 bg-white ${error ? 'border-brick-700' : 'border-ink-500'}`}>
        {/* The line to sign on; decorative, under the transparent canvas. */}
        <div aria-hidden="true" className="pointer-events-none absolute inset-x-6 bottom-12 border-b-2 border-dashed border-sand-300" />
        {/* Drawn with a finger or stylus only; the line below says in words whether it holds a signature. */}
        <canvas
          ref={canvasRef}
          aria-hidden="true"
          className="relative block h-60 w-full cursor-crosshair touch-none rounded-xl select-none"
          data-testid="signature-canvas"
        />
      </div>
      <p aria-live="polite" className="sr-only">
        {empty ? 'Nothing is drawn in the signature box.' : 'Your signature is in the box.'}
      </p>
      {error ? (
        <p id={errorId} className="flex items-start gap-1 text-lg font-semibold text-brick-700" data-testid="signature-error">
          <span aria-hidden="true">!</span>
          {error}
        </p>
      ) : null}
      <div className="flex flex-wrap gap-3">
        <Button variant="secondary" onClick={undo} disabled={disabled || empty} className="min-w-28 text-lg">
          Undo
        </Button>
        <Button variant="secondary" onClick={clear} disabled={disabled || empty} className="min-w-28 text-lg">
          Clear
        </Button>
      </div>
    </fieldset>
  );
}
