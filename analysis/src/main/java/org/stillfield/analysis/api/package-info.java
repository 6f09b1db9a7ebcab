/** Value records of the analysis: correlation rows and tables, verdicts, amplitude-check results. */
package org.stillfield.analysis.api;
