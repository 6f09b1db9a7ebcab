/**
 * Datasets: one run's modes, points, mode amplitudes and field values as Parquet tables in a
 * folder, with a manifest of sizes and SHA-256 hashes.
 *
 * <p>Layout ({@code stillfield-dataset/1}):
 * <ul>
 *   <li>{@code modes.parquet}: one row per mode (label, k, ω, f, window weight, thermal factor,
 *       vacuum and drawn variances of A, E, B);</li>
 *   <li>{@code points.parquet}: one row per evaluation point (set, kind, grid index, position,
 *       inside flag);</li>
 *   <li>{@code amplitudes.parquet}: one row per (sample, mode): q (V·s/m) and e (V/m), float64;</li>
 *   <li>{@code fields.parquet}: one row per (sample, point): the three components of each field,
 *       float64 or float32, null outside the cavity;</li>
 *   <li>{@code manifest.json}: written last; format, run, counts and each file's rows, bytes,
 *       SHA-256.</li>
 * </ul>
 * Every Parquet footer holds the spec text, versions, constants, generator, seed, cavity, window,
 * state, sample count, table name and column units ({@code stillfield.*} keys). Pages are ZSTD
 * compressed unless {@code output.compression} says snappy or none; floating-point columns use
 * BYTE_STREAM_SPLIT encoding; the dataset's tables are written a page at a time by
 * {@code ColumnBlockWriter}, with DELTA_BINARY_PACKED integer columns.
 *
 * <p>Files are read and written without Hadoop's file system or configuration classes: local
 * files, {@code PlainParquetConfiguration} and pure-Java codecs. A plain Parquet reader opening
 * these files must likewise be given a {@code PlainParquetConfiguration}, since Hadoop's
 * configuration needs libraries that are not on the classpath.
 */
package org.stillfield.sampler.io;
