import { useEffect, useRef, useState, type FormEvent } from 'react';
import { CAMERA_PROBLEM_MESSAGES, cameraProblem, type CameraProblem } from '../lib/scanned-code.ts';
import { Button } from './ui/button.tsx';
import { ErrorBanner } from './ui/error-banner.tsx';
import { TextField } from './ui/text-field.tsx';

type Decode = (image: ImageData) => string;

type ScanState = { kind: 'starting' } | { kind: 'scanning' } | { kind: 'read' } | { kind: 'unavailable'; problem: CameraProblem };

// Larger camera frames are shrunk to this many pixels on their long side before decoding: a code
// filling a quarter of the frame keeps several pixels per module, and a frame decodes well within
// one screen refresh on a tablet.
const MAX_DECODE_SIDE = 800;

/** The reader lives in its own chunk, fetched when a scanner first opens, so no other page carries it. */
function loadDecoder(): Promise<Decode | null> {
  return import('qr/decode.js').then(
    (m) => (image: ImageData) => m.decodeQR(image),
    () => null,
  );
}

interface CameraViewProps {
  onScanning: () => void;
  onCode: (text: string) => void;
  onProblem: (problem: CameraProblem) => void;
}

/**
 * The live camera and its frame loop. It holds the camera only while it is mounted: the scanner
 * unmounts it on a read, on a problem and when it leaves the screen, and every track stops then.
 */
function CameraView({ onScanning, onCode, onProblem }: CameraViewProps) {
  const videoRef = useRef<HTMLVideoElement>(null);
  const handlers = useRef({ onScanning, onCode, onProblem });
  useEffect(() => {
    handlers.current = { onScanning, onCode, onProblem };
  });

  useEffect(() => {
    let stopped = false;
    let stream: MediaStream | null = null;
    let frame = 0;
    const video = videoRef.current;

    async function start() {
      if (!video || !navigator.mediaDevices?.getUserMedia) return handlers.current.onProblem('unsupported');
      const decoder = loadDecoder();
      try {
        stream = await navigator.mediaDevices.getUserMedia({ video: { facingMode: { ideal: 'environment' } }, audio: false });
      } catch (err) {
        if (!stopped) handlers.current.onProblem(cameraProblem(err));
        return;
      }
      // Unmounted while the browser was asking: the cleanup ran before there was a stream to stop.
      if (stopped) return stopTracks();
      video.srcObject = stream;
      const decode = await decoder;
      if (stopped) return;
      if (!decode) return handlers.current.onProblem('reader');
      try {
        await video.play();
      } catch (err) {
        if (!stopped) handlers.current.onProblem(cameraProblem(err));
        return;
      }
      if (stopped) return;
      handlers.current.onScanning();
      scan(video, decode);
    }

    function scan(source: HTMLVideoElement, decode: Decode) {
      const canvas = document.createElement('canvas');
      const context = canvas.getContext('2d', { willReadFrequently: true });
      if (!context) return handlers.current.onProblem('failed');
      let lastTime = -1;
      const tick = () => {
        if (stopped) return;
        if (source.readyState >= HTMLMediaElement.HAVE_CURRENT_DATA && source.videoWidth > 0 && source.currentTime !== lastTime) {
          lastTime = source.currentTime;
          const scale = Math.min(1, MAX_DECODE_SIDE / Math.max(source.videoWidth, source.videoHeight));
          const width = Math.round(source.videoWidth * scale);
          const height = Math.round(source.videoHeight * scale);
          if (canvas.width !== width || canvas.height !== height) {
            canvas.width = width;
            canvas.height = height;
          }
          context.drawImage(source, 0, 0, width, height);
          let text = '';
          try {
            text = decode(context.getImageData(0, 0, width, height));
          } catch {
            // No code in this frame: the next one may hold it.
          }
          if (text) return handlers.current.onCode(text);
        }
        frame = requestAnimationFrame(tick);
      };
      frame = requestAnimationFrame(tick);
    }

    function stopTracks() {
      for (const track of stream?.getTracks() ?? []) track.stop();
      stream = null;
    }

    void start();
    return () => {
      stopped = true;
      cancelAnimationFrame(frame);
      stopTracks();
      if (video) video.srcObject = null;
    };
  }, []);

  return (
    <div className="relative aspect-[4/3] w-full max-w-2xl overflow-hidden rounded-xl bg-graphite-900">
      <video ref={videoRef} muted playsInline disablePictureInPicture aria-label="Camera view" className="size-full object-cover" />
      {/* A square to aim with; the reader looks at the whole frame, so it is only a guide. */}
      <div aria-hidden="true" className="pointer-events-none absolute top-1/2 left-1/2 aspect-square h-3/5 -translate-x-1/2 -translate-y-1/2 rounded-xl border-4 border-white outline-2 outline-graphite-900" />
    </div>
  );
}

export interface QrScannerProps {
  /** Receives the first code the camera reads or the person types, once. */
  onResult: (text: string) => void;
  /** Names the scanner's region for assistive technology, e.g. "Scan a shelf label". */
  label?: string;
  /** The typed fallback's label. */
  manualLabel?: string;
  manualHint?: string;
}

/**
 * Reads a QR code with the device's camera (the rear one where there is a choice). The camera
 * stops as soon as a code is read and when the scanner leaves the screen; when there is no camera
 * or no permission the person reads why, and can always type the code instead.
 */
export function QrScanner({ onResult, label = 'Scan a code', manualLabel = 'Or type the code', manualHint }: QrScannerProps) {
  const [state, setState] = useState<ScanState>({ kind: 'starting' });
  const [attempt, setAttempt] = useState(0);
  const [typed, setTyped] = useState('');
  const [typedError, setTypedError] = useState<string | undefined>();
  const done = useRef(false);

  function finish(text: string) {
    if (done.current) return;
    done.current = true;
    setState({ kind: 'read' });
    onResult(text);
  }

  function onTyped(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const text = typed.trim();
    if (!text) {
      setTypedError('Type the code, or point the camera at it.');
      return;
    }
    setTypedError(undefined);
    finish(text);
  }

  function retry() {
    setState({ kind: 'starting' });
    setAttempt((n) => n + 1);
  }

  const status = state.kind === 'starting' ? 'Starting the camera…' : state.kind === 'scanning' ? 'Point the camera at the code' : state.kind === 'read' ? 'Code read.' : null;

  return (
    <section aria-label={label} className="flex flex-col gap-4 rounded-2xl border border-plaster-300 bg-white p-4 sm:p-6" data-testid="qr-scanner">
      {status ? (
        <output className="block text-lg font-semibold text-graphite-900" data-testid="qr-scanner-status">
          {status}
        </output>
      ) : null}
      {state.kind === 'starting' || state.kind === 'scanning' ? (
        <CameraView
          key={attempt}
          onScanning={() => setState((s) => (s.kind === 'starting' ? { kind: 'scanning' } : s))}
          onCode={finish}
          onProblem={(problem) => setState({ kind: 'unavailable', problem })}
        />
      ) : null}
      {state.kind === 'unavailable' ? (
        <ErrorBanner title="The camera is not available" message={CAMERA_PROBLEM_MESSAGES[state.problem]} onRetry={state.problem === 'unsupported' ? undefined : retry} />
      ) : null}
      {state.kind === 'read' ? null : (
        <form noValidate onSubmit={onTyped} className="flex max-w-2xl flex-col gap-3" aria-label="Type the code">
          <TextField label={manualLabel} hint={manualHint} error={typedError} value={typed} autoComplete="off" spellCheck={false} onChange={(e) => setTyped(e.target.value)} />
          <div>
            <Button type="submit" variant="secondary">
              Open
            </Button>
          </div>
        </form>
      )}
    </section>
  );
}
