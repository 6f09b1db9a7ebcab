package org.stillfield.viz;

import java.util.Locale;
import java.util.Map;
import org.stillfield.analysis.api.Verdict;
import org.stillfield.sampler.api.Version;

/** Renders {@link RunReport.Content} as one self-contained HTML page. */
final class ReportHtml {
    static final String CSS = String.join("\n",
        ":root{--ink:#22262e;--muted:#5c6370;--line:#e1e4ea;--paper:#ffffff;--wash:#f5f6f8;",
        "--pass:#1e7b4f;--pass-wash:#e8f4ee;--fail:#b3261e;--fail-wash:#fbeceb;--none:#6b6f78;}",
        "*{box-sizing:border-box}",
        "body{margin:0;background:var(--wash);color:var(--ink);",
        "font:15px/1.5 system-ui,-apple-system,'Segoe UI','DejaVu Sans',Helvetica,Arial,sans-serif}",
        "main{max-width:1080px;margin:0 auto;padding:28px 28px 40px}",
        ".kicker{margin:0;color:var(--muted);font-size:13px;letter-spacing:.08em;text-transform:uppercase}",
        "h1{margin:2px 0 4px;font-size:30px;font-weight:650}",
        ".lede{margin:0 0 22px;color:var(--muted);font-size:16px}",
        "h2{font-size:19px;margin:34px 0 12px;font-weight:650}",
        ".verdict{display:flex;gap:26px;align-items:center;padding:20px 24px;border-radius:10px;",
        "border-left:10px solid var(--none);background:var(--paper);box-shadow:0 1px 2px rgba(0,0,0,.06)}",
        ".verdict.pass{border-color:var(--pass);background:var(--pass-wash)}",
        ".verdict.fail{border-color:var(--fail);background:var(--fail-wash)}",
        ".verdict .word{font-size:46px;font-weight:800;letter-spacing:.04em;min-width:150px}",
        ".verdict.pass .word{color:var(--pass)}.verdict.fail .word{color:var(--fail)}",
        ".verdict .sentence{margin:0 0 10px;font-size:17px}",
        ".stats{display:flex;flex-wrap:wrap;gap:8px 26px;margin:0}",
        ".stats div{min-width:120px}.stats dt{color:var(--muted);font-size:12px;text-transform:uppercase;",
        "letter-spacing:.05em}.stats dd{margin:0;font-size:17px;font-variant-numeric:tabular-nums}",
        ".method{margin:10px 0 0;color:var(--muted);font-size:13px}",
        ".cards{display:grid;grid-template-columns:repeat(auto-fit,minmax(320px,1fr));gap:16px}",
        ".card{background:var(--paper);border:1px solid var(--line);border-radius:8px;padding:12px 16px}",
        ".card h3{margin:0 0 6px;font-size:15px;font-weight:650}",
        "table{border-collapse:collapse;width:100%}",
        ".kv th{text-align:left;font-weight:normal;color:var(--muted);padding:3px 12px 3px 0;vertical-align:top;",
        "white-space:nowrap;width:1%}.kv td{padding:3px 0;overflow-wrap:anywhere}",
        "figure{margin:0 0 22px;background:var(--paper);border:1px solid var(--line);border-radius:8px;",
        "padding:14px}figure img{display:block;max-width:100%;height:auto;margin:0 auto}",
        "figcaption{margin-top:8px;color:var(--ink);font-size:14px}figcaption b{font-weight:650}",
        ".rows{background:var(--paper);border:1px solid var(--line);border-radius:8px;overflow-x:auto}",
        ".rows th,.rows td{padding:6px 10px;border-bottom:1px solid var(--line);text-align:right;",
        "font-variant-numeric:tabular-nums;white-space:nowrap}",
        ".rows th{background:var(--wash);font-weight:600;color:var(--muted)}",
        ".rows td.l,.rows th.l{text-align:left}.rows td.hot{color:var(--fail);font-weight:650}",
        "footer{margin-top:36px;padding-top:14px;border-top:1px solid var(--line);color:var(--muted);",
        "font-size:13px}footer p{margin:0 0 6px}");

    private ReportHtml() {
    }

    static String render(RunReport.Content c) {
        StringBuilder b = new StringBuilder(16_384);
        b.append("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n")
            .append("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n")
            .append("<title>").append(esc(c.name())).append(" · Stillfield run report</title>\n")
            .append("<style>\n").append(CSS).append("\n</style>\n</head>\n<body>\n<main>\n");

        b.append("<header>\n<p class=\"kicker\">Stillfield run report</p>\n<h1>").append(esc(c.name()))
            .append("</h1>\n<p class=\"lede\">").append(esc(c.headline())).append("</p>\n</header>\n");

        verdict(b, c.verdict(), c.samples());

        b.append("<h2>Settings</h2>\n<div class=\"cards\">\n");
        for (RunReport.Section s : c.sections()) {
            b.append("<div class=\"card\">\n<h3>").append(esc(s.title())).append("</h3>\n<table class=\"kv\">\n");
            for (Map.Entry<String, String> e : s.lines().entrySet()) {
                b.append("<tr><th>").append(esc(e.getKey())).append("</th><td>").append(esc(e.getValue()))
                    .append("</td></tr>\n");
            }
            b.append("</table>\n</div>\n");
        }
        b.append("</div>\n");

        if (!c.figures().isEmpty()) {
            b.append("<h2>Figures</h2>\n");
            for (int k = 0; k < c.figures().size(); k++) {
                Figure f = c.figures().get(k);
                b.append("<figure id=\"fig").append(k + 1).append("\">\n<img src=\"").append(esc(c.figurePaths().get(k)))
                    .append("\" alt=\"").append(esc(f.title())).append("\">\n<figcaption><b>Figure ").append(k + 1)
                    .append(". ").append(esc(f.title())).append(".</b> ").append(esc(f.caption()))
                    .append("</figcaption>\n</figure>\n");
            }
        }

        b.append("<h2>Largest deviations</h2>\n");
        if (c.worst().isEmpty()) {
            b.append("<p>The correlation table is empty.</p>\n");
        } else {
            double crit = c.verdict() == null ? Double.NaN : c.verdict().threshold();
            b.append("<div class=\"rows\">\n<table>\n<tr>");
            String[] head = c.worstHeader().get(0);
            for (int k = 0; k < head.length; k++) {
                b.append(k < 4 || k == 8 ? "<th class=\"l\">" : "<th>").append(esc(head[k])).append("</th>");
            }
            b.append("</tr>\n");
            for (String[] row : c.worst()) {
                b.append("<tr>");
                for (int k = 0; k < row.length; k++) {
                    boolean hot = k == 7 && Double.isFinite(crit) && Math.abs(Double.parseDouble(row[7])) > crit;
                    b.append(k < 4 || k == 8 ? "<td class=\"l\">" : hot ? "<td class=\"hot\">" : "<td>")
                        .append(esc(row[k])).append("</td>");
                }
                b.append("</tr>\n");
            }
            b.append("</table>\n</div>\n");
            b.append("<p class=\"method\">The ").append(c.worst().size()).append(" rows with the largest |z| of ")
                .append(c.tests() > 0 ? c.tests() + " tested" : "all").append(
                    "; z = (estimate − mode sum) / standard error.</p>\n");
        }

        b.append("<footer>\n<p>").append(esc(c.footer())).append("</p>\n<p>Stillfield ").append(esc(Version.VERSION))
            .append(" · dataset format ").append(esc(Version.DATASET_FORMAT)).append("</p>\n</footer>\n");
        b.append("</main>\n</body>\n</html>\n");
        return b.toString();
    }

    private static void verdict(StringBuilder b, Verdict v, long samples) {
        String cls = v == null ? "" : v.passed() ? " pass" : " fail";
        b.append("<section class=\"verdict").append(cls).append("\" id=\"verdict\">\n<div class=\"word\">")
            .append(RunReport.verdictWord(v)).append("</div>\n<div>\n<p class=\"sentence\">")
            .append(esc(RunReport.verdictSentence(v))).append("</p>\n");
        if (v != null) {
            b.append("<dl class=\"stats\">\n");
            stat(b, "worst |z|", String.format(Locale.ROOT, "%.3g", v.worst()));
            stat(b, "critical |z|", String.format(Locale.ROOT, "%.3g", v.threshold()));
            stat(b, "statistics", Integer.toString(v.tests()));
            stat(b, "false-alarm rate", percent(v.falseAlarm()));
            stat(b, "samples N", Long.toString(samples));
            b.append("</dl>\n<p class=\"method\">Method: ").append(esc(v.method())).append("</p>\n");
        }
        b.append("</div>\n</section>\n");
    }

    static String percent(double p) {
        return ChartStyle.trimZeros(String.format(Locale.ROOT, "%.3g", 100 * p)) + " %";
    }

    private static void stat(StringBuilder b, String k, String v) {
        b.append("<div><dt>").append(esc(k)).append("</dt><dd>").append(esc(v)).append("</dd></div>\n");
    }

    static String esc(String s) {
        StringBuilder o = new StringBuilder(s.length() + 16);
        for (int i = 0; i < s.length(); i++) {
            char ch = s.charAt(i);
            switch (ch) {
                case '&': o.append("&amp;"); break;
                case '<': o.append("&lt;"); break;
                case '>': o.append("&gt;"); break;
                case '"': o.append("&quot;"); break;
                case '\'': o.append("&#39;"); break;
                default: o.append(ch);
            }
        }
        return o.toString();
    }
}
