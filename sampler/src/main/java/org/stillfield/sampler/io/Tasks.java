package org.stillfield.sampler.io;

import java.io.IOException;
import java.util.concurrent.ExecutionException;

/** The failure of a task run on a writer's own thread, rethrown on the thread that waits for it. */
final class Tasks {
    private Tasks() {
    }

    /**
     * Rethrows an unchecked cause as it was thrown, and returns an I/O cause (or a wrapped checked
     * one) for the caller to throw.
     *
     * @param ex what {@code Future.get} threw
     * @param what names the task, for a cause that is neither I/O nor unchecked
     * @return the I/O failure to throw
     */
    static IOException failure(ExecutionException ex, String what) {
        Throwable cause = ex.getCause();
        if (cause instanceof IOException) {
            return (IOException) cause;
        }
        if (cause instanceof RuntimeException) {
            throw (RuntimeException) cause;
        }
        if (cause instanceof Error) {
            throw (Error) cause;
        }
        return new IOException(what, cause);
    }
}
