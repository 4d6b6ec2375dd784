// TensorFlow.js (cpu backend) as the independent reference for the kernels: helpers to move buffers in and
// out and to measure agreement. Test-only; src/ never imports TensorFlow.js.
import * as tf from '@tensorflow/tfjs';

let ready: Promise<void> | null = null;

/** Returns once the cpu backend is active. */
export function useCpu(): Promise<void> {
  ready ??= (async () => {
    await tf.setBackend('cpu');
    await tf.ready();
  })();
  return ready;
}

/** Returns ‖a − b‖∞ / ‖b‖∞, the relative error the TensorFlow.js comparisons are held to (1e-3). */
export function relErr(a: ArrayLike<number>, b: ArrayLike<number>): number {
  if (a.length !== b.length) throw new Error(`length ${a.length} vs ${b.length}`);
  let d = 0, m = 0;
  for (let i = 0; i < a.length; i++) {
    d = Math.max(d, Math.abs(a[i]! - b[i]!));
    m = Math.max(m, Math.abs(b[i]!));
  }
  return m === 0 ? d : d / m;
}

/** Returns the tensor's values as a Float32Array (synchronously, cpu backend). */
export function values(t: tf.Tensor): Float32Array {
  return t.dataSync() as Float32Array;
}

export { tf };
