/**
 * Charts and the run report: headless JFreeChart PNGs of correlations along a line
 * ({@link org.stillfield.viz.CorrelationLinePlot}), single-sample field slices
 * ({@link org.stillfield.viz.FieldSliceHeatMap}) and the mode-count staircase
 * ({@link org.stillfield.viz.ModeCountPlot}), gathered with the run's settings and verdict into
 * one self-contained HTML page by {@link org.stillfield.viz.RunReport}.
 *
 * <p>Every chart is drawn with {@code java.awt.headless=true}; no display is ever needed.
 */
package org.stillfield.viz;
