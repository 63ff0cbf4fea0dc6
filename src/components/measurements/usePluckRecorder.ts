import { onScopeDispose, ref, shallowRef, type Ref, type ShallowRef } from 'vue';
import { encodeWav, meterPercent, rmsLevel } from './encodeWav';

/** Where a recording stands. */
export type RecorderPhase = 'idle' | 'asking' | 'countdown' | 'recording' | 'done' | 'error';

/** State and actions of a pluck recording made with the device's microphone. */
export interface PluckRecorder {
  phase: Ref<RecorderPhase>;
  /** Seconds left in the countdown (3, 2, 1) or in the recording. */
  secondsLeft: Ref<number>;
  /** Input level for the meter, 0–100. */
  level: Ref<number>;
  /** The finished recording as a WAV file (null until done). */
  file: ShallowRef<File | null>;
  /** What went wrong, in words for the maker. */
  error: Ref<string>;
  /** Asks for the microphone, counts down, records, then encodes the WAV. */
  start: () => Promise<void>;
  /** Stops early (keeps what was recorded if it is long enough) or cancels the countdown. */
  stop: () => void;
  /** Forgets the recording. */
  reset: () => void;
}

/** Options of {@link usePluckRecorder}. */
export interface PluckRecorderOptions {
  /** Countdown before recording starts [s]. */
  countdownS?: number;
  /** Length of the recording [s]: long enough for the pluck to ring out, short enough to stay far below the upload limit. */
  durationS?: number;
  /** Name of the file handed to the upload. */
  fileName?: () => string;
}

/** The shortest recording the analysis accepts is 0.5 s; anything shorter is discarded. */
const MIN_RECORDING_S = 0.5;

/**
 * Records a pluck with the microphone: `getUserMedia` with the phone's voice processing off (echo cancellation,
 * noise suppression and automatic gain would smear the tone), a short countdown so the maker can get ready, a level
 * meter, then the samples are encoded as a 16-bit PCM mono WAV in the browser and handed over as a File, to be
 * uploaded exactly like a chosen WAV file. A ScriptProcessorNode collects the samples: it runs everywhere the Web
 * Audio API does and needs no separate module file.
 * @param options - countdown and duration [s], file name
 */
export function usePluckRecorder(options: PluckRecorderOptions = {}): PluckRecorder {
  const countdownS = options.countdownS ?? 3;
  const durationS = options.durationS ?? 3;
  const phase = ref<RecorderPhase>('idle');
  const secondsLeft = ref(0);
  const level = ref(0);
  const file = shallowRef<File | null>(null);
  const error = ref('');

  let stream: MediaStream | null = null;
  let context: AudioContext | null = null;
  let processor: ScriptProcessorNode | null = null;
  let timer: ReturnType<typeof setInterval> | null = null;
  let chunks: Float32Array[] = [];
  let isCapturing = false;
  let sampleRateHz = 48000;
  let finish: (() => void) | null = null;

  function release(): void {
    if (timer) clearInterval(timer);
    timer = null;
    processor?.disconnect();
    processor = null;
    stream?.getTracks().forEach((t) => t.stop());
    stream = null;
    void context?.close().catch(() => undefined);
    context = null;
    isCapturing = false;
    level.value = 0;
  }

  function fail(message: string): void {
    release();
    error.value = message;
    phase.value = 'error';
  }

  function encode(): void {
    const total = chunks.reduce((n, c) => n + c.length, 0);
    if (total < MIN_RECORDING_S * sampleRateHz) {
      fail('The recording was too short. Start again and let it run until the pluck has rung out.');
      return;
    }
    const samples = new Float32Array(total);
    let offset = 0;
    for (const c of chunks) {
      samples.set(c, offset);
      offset += c.length;
    }
    chunks = [];
    const name = options.fileName?.() ?? 'pluck.wav';
    file.value = new File([encodeWav(samples, Math.round(sampleRateHz))], name, { type: 'audio/wav' });
    phase.value = 'done';
  }

  async function start(): Promise<void> {
    if (phase.value === 'asking' || phase.value === 'countdown' || phase.value === 'recording') return;
    reset();
    if (typeof navigator === 'undefined' || !navigator.mediaDevices?.getUserMedia) {
      fail('This browser cannot record from a microphone here. Use a WAV file from a recording app instead.');
      return;
    }
    phase.value = 'asking';
    try {
      stream = await navigator.mediaDevices.getUserMedia({
        audio: { echoCancellation: false, noiseSuppression: false, autoGainControl: false, channelCount: 1 },
      });
    } catch (err) {
      const denied = err instanceof DOMException && (err.name === 'NotAllowedError' || err.name === 'SecurityError');
      fail(
        denied
          ? 'The microphone is blocked. Allow it for this site in the browser settings, or upload a WAV file instead.'
          : 'No microphone could be opened. Plug one in or upload a WAV file instead.',
      );
      return;
    }
    const AudioContextClass = window.AudioContext ?? (window as unknown as { webkitAudioContext?: typeof AudioContext }).webkitAudioContext;
    context = new AudioContextClass();
    sampleRateHz = context.sampleRate;
    const source = context.createMediaStreamSource(stream);
    processor = context.createScriptProcessor(4096, 1, 1);
    processor.onaudioprocess = (event) => {
      const input = event.inputBuffer.getChannelData(0);
      level.value = meterPercent(rmsLevel(input));
      if (isCapturing) chunks.push(new Float32Array(input));
    };
    source.connect(processor);
    // A ScriptProcessorNode only runs while connected to the destination; it writes nothing to its output, so nothing is heard.
    processor.connect(context.destination);
    await context.resume().catch(() => undefined);

    phase.value = 'countdown';
    secondsLeft.value = countdownS;
    await new Promise<void>((resolve) => {
      finish = resolve;
      timer = setInterval(() => {
        secondsLeft.value -= 1;
        if (secondsLeft.value <= 0) resolve();
      }, 1000);
    });
    if (timer) clearInterval(timer);
    if (phase.value !== 'countdown') return; // stopped during the countdown

    phase.value = 'recording';
    isCapturing = true;
    secondsLeft.value = durationS;
    await new Promise<void>((resolve) => {
      finish = resolve;
      timer = setInterval(() => {
        secondsLeft.value -= 1;
        if (secondsLeft.value <= 0) resolve();
      }, 1000);
    });
    finish = null;
    if (phase.value !== 'recording') return;
    release();
    encode();
  }

  function stop(): void {
    if (phase.value === 'countdown' || phase.value === 'asking') {
      release();
      phase.value = 'idle';
      finish?.();
      return;
    }
    if (phase.value === 'recording') {
      finish?.();
    }
  }

  function reset(): void {
    if (phase.value === 'recording' || phase.value === 'countdown') {
      phase.value = 'idle';
      finish?.();
    }
    release();
    chunks = [];
    file.value = null;
    error.value = '';
    phase.value = 'idle';
    secondsLeft.value = 0;
  }

  onScopeDispose(() => {
    finish?.();
    release();
  });

  return { phase, secondsLeft, level, file, error, start, stop, reset };
}
