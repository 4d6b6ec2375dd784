// The softsign nonlinearity y = x / (1 + |x|) (Elliott 1993; named softsign by Bergstra et al. 2009):
// bounded like tanh but without a transcendental call, which matters on the model's hottest loops (the
// pair messages, the factor heads and the node update; V8's Math.tanh costs ~25 ns, this ~2 ns).
// Its derivative 1 / (1 + |x|)² equals (1 − |y|)², so backward needs only the output.
import type { Buf } from '../nn/types.js';

/** Returns y after y = x / (1 + |x|) over the first n entries (y may be x). */
export function softsign(x: Buf, y: Buf, n: number): Buf {
  for (let i = 0; i < n; i++) {
    const v = x[i]!;
    y[i] = v / (1 + Math.abs(v));
  }
  return y;
}

/** Returns dx after dx = dy · (1 − |y|)² from the output y (dx may be dy). */
export function softsignBackward(y: Buf, dy: Buf, dx: Buf, n: number): Buf {
  for (let i = 0; i < n; i++) {
    const a = 1 - Math.abs(y[i]!);
    dx[i] = dy[i]! * a * a;
  }
  return dx;
}
