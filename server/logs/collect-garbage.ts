import v8 from 'node:v8';
import vm from 'node:vm';

let gc: (() => void) | null = null;

/**
 * A full garbage collection of this thread's heap. Shared memory (the columns a log is read into) is freed
 * only when every thread that saw it has let go of it, and an idle thread collects nothing: the parse
 * helper, whose heap is small, collects after each range so it never keeps a log's columns alive; the
 * pipeline worker collects once, after its warm-up. `--expose-gc` is switched on here rather than on the
 * command line (a worker cannot take V8 options); it only adds the `gc` function, read once from a new
 * context.
 */
export function collectGarbage() {
  if (!gc) {
    v8.setFlagsFromString('--expose-gc');
    gc = vm.runInNewContext('gc') as () => void;
  }
  gc();
}
