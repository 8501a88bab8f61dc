import v8 from 'node:v8';
import vm from 'node:vm';

let gc: (() => void) | null = null;

/**
 * A full garbage collection of this thread's heap, for a worker that has just finished a log. Shared memory
 * (the file's bytes, the columns) is freed only when every thread that saw it has let go of it, and an idle
 * worker collects nothing: without this, the worker kept the last log's columns alive until the next log.
 * `--expose-gc` is switched on here rather than on the command line (a worker cannot take V8 options); it
 * only adds the `gc` function, read once from a new context.
 */
export function collectGarbage() {
  if (!gc) {
    v8.setFlagsFromString('--expose-gc');
    gc = vm.runInNewContext('gc') as () => void;
  }
  gc();
}
