package org.stillfield.viz;

import java.util.Locale;
import java.util.Map;
import org.stillfield.analysis.api.Verdict;
import org.stillfield.sampler.api.Version;

/** Renders {@link RunReport.Content} as Markdown with the same content as the HTML page. */
final class ReportMarkdown {
    private ReportMarkdown() {
    }

    static String render(RunReport.Content c) {
        StringBuilder b = new StringBuilder(8192);
        b.append("# ").append(c.name()).append(" · Stillfield run report\n\n").append(c.headline()).append("\n\n");

        Verdict v = c.verdict();
        b.append("## Verdict: **").append(RunReport.verdictWord(v)).append("**\n\n")
            .append(RunReport.verdictSentence(v)).append("\n\n");
        if (v != null) {
            b.append("| worst \\|z\\| | critical \\|z\\| | statistics | false-alarm rate | samples N |\n")
                .append("|---:|---:|---:|---:|---:|\n")
                .append(String.format(Locale.ROOT, "| %.3g | %.3g | %d | %s | %d |%n%n", v.worst(), v.threshold(),
                    v.tests(), ReportHtml.percent(v.falseAlarm()), c.samples()))
                .append("Method: ").append(cell(v.method())).append("\n\n");
        }

        b.append("## Settings\n\n");
        for (RunReport.Section s : c.sections()) {
            b.append("### ").append(s.title()).append("\n\n| | |\n|---|---|\n");
            for (Map.Entry<String, String> e : s.lines().entrySet()) {
                b.append("| ").append(cell(e.getKey())).append(" | ").append(cell(e.getValue())).append(" |\n");
            }
            b.append('\n');
        }

        if (!c.figures().isEmpty()) {
            b.append("## Figures\n\n");
            for (int k = 0; k < c.figures().size(); k++) {
                Figure f = c.figures().get(k);
                b.append("![").append(f.title()).append("](").append(c.figurePaths().get(k).replace(" ", "%20"))
                    .append(")\n\n*Figure ").append(k + 1).append(". ").append(f.title()).append(".* ")
                    .append(f.caption()).append("\n\n");
            }
        }

        b.append("## Largest deviations\n\n");
        if (c.worst().isEmpty()) {
            b.append("The correlation table is empty.\n\n");
        } else {
            String[] head = c.worstHeader().get(0);
            b.append('|');
            for (String h : head) {
                b.append(' ').append(cell(h)).append(" |");
            }
            b.append("\n|");
            for (int k = 0; k < head.length; k++) {
                b.append(k < 4 || k == 8 ? "---|" : "---:|");
            }
            b.append('\n');
            for (String[] row : c.worst()) {
                b.append('|');
                for (String x : row) {
                    b.append(' ').append(cell(x)).append(" |");
                }
                b.append('\n');
            }
            b.append("\nz = (estimate − mode sum) / standard error.\n\n");
        }
        b.append("---\n\n").append(c.footer()).append("\n\nStillfield ").append(Version.VERSION)
            .append(" · dataset format ").append(Version.DATASET_FORMAT).append('\n');
        return b.toString();
    }

    /** Table cells may not hold a bare pipe or a line break. */
    private static String cell(String s) {
        return s.replace("|", "\\|").replace("\n", " ");
    }
}
