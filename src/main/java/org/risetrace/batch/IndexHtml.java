package org.risetrace.batch;

import static org.risetrace.report.Html.esc;

import java.nio.charset.StandardCharsets;
import java.net.URLEncoder;
import java.util.List;
import java.util.Locale;

/**
 * index.html: one table row per series with a link to its report; clicking a column header sorts by it (numbers
 * as numbers, a second click reverses). One self-contained file: inline style and script, no external address, so
 * it works from file:// and offline.
 */
public final class IndexHtml {
    public static final String FILE_NAME = "index.html";

    private IndexHtml() {
    }

    public static String toHtml(BatchSummary summary) {
        StringBuilder sb = new StringBuilder(4096);
        sb.append("<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\">\n<title>risetrace batch</title>\n")
                .append("<style>body{font:14px system-ui,sans-serif;margin:1.5em}table{border-collapse:collapse}")
                .append("th,td{border:1px solid #bbb;padding:.25em .5em;text-align:left;vertical-align:top}")
                .append("th{background:#eee;cursor:pointer;user-select:none}th:hover{background:#ddd}")
                .append("td.n{text-align:right;font-variant-numeric:tabular-nums}tr.failed td{background:#fdecea}")
                .append(".small{color:#555;font-size:12px}</style></head><body>\n")
                .append("<h1>Batch summary</h1>\n<p>").append(summary.total()).append(" series, ")
                .append(summary.failed()).append(" failed")
                .append(summary.shard() == null ? "" : ", shard " + esc(summary.shard()))
                .append(". Click a column header to sort.</p>\n<table id=\"series\"><thead><tr>");
        String[] head = {"Series", "Frames", "Duration (s)", "Mode", "Status", "Designator", "Rate (K/s)",
                "Separation (\u03c3)", "Warnings", "Error"};
        boolean[] numeric = {false, true, true, false, false, false, true, true, false, false};
        for (int i = 0; i < head.length; i++)
            sb.append("<th data-type=\"").append(numeric[i] ? "n" : "s").append("\">").append(esc(head[i])).append("</th>");
        sb.append("</tr></thead>\n<tbody>\n");
        for (SeriesSummary r : summary.series()) {
            sb.append(r.failed() ? "<tr class=\"failed\">" : "<tr>");
            sb.append("<td>");
            if (r.report() != null)
                sb.append("<a href=\"").append(esc(href(r.report()))).append("\">").append(esc(r.series())).append("</a>");
            else sb.append(esc(r.series()));
            sb.append("</td>");
            num(sb, r.frames() == null ? null : r.frames().doubleValue(), "%.0f");
            num(sb, r.durationS(), "%.1f");
            sb.append("<td>").append(esc(r.mode())).append("</td>");
            sb.append("<td>").append(esc(r.status())).append("</td>");
            sb.append("<td>").append(esc(r.designator())).append("</td>");
            num(sb, r.rateKPerS(), "%.3g");
            num(sb, r.separationSigma(), "%.3g");
            sb.append("<td class=\"small\">").append(esc(String.join("; ", r.warnings()))).append("</td>");
            sb.append("<td class=\"small\">").append(esc(r.error())).append("</td></tr>\n");
        }
        sb.append("</tbody></table>\n").append(SCRIPT).append("</body></html>\n");
        return sb.toString();
    }

    /** Sorts the body rows by the clicked column: data-v (the exact number) for numeric columns, else the text. */
    private static final String SCRIPT = """
            <script>
            document.querySelectorAll('#series th').forEach(function (th, col) {
              th.addEventListener('click', function () {
                var body = document.querySelector('#series tbody');
                var rows = Array.prototype.slice.call(body.rows);
                var dir = th.dataset.dir === 'up' ? -1 : 1;
                th.parentNode.querySelectorAll('th').forEach(function (h) { delete h.dataset.dir; });
                th.dataset.dir = dir === 1 ? 'up' : 'down';
                var numeric = th.dataset.type === 'n';
                rows.sort(function (a, b) {
                  var x = a.cells[col], y = b.cells[col];
                  if (numeric) {
                    var p = parseFloat(x.dataset.v), q = parseFloat(y.dataset.v);
                    if (isNaN(p)) return isNaN(q) ? 0 : 1;
                    if (isNaN(q)) return -1;
                    return dir * (p - q);
                  }
                  return dir * x.textContent.localeCompare(y.textContent);
                });
                rows.forEach(function (r) { body.appendChild(r); });
              });
            });
            </script>
            """;

    private static void num(StringBuilder sb, Double v, String format) {
        if (v == null || !Double.isFinite(v)) {
            sb.append("<td class=\"n\" data-v=\"\">\u2013</td>");
            return;
        }
        sb.append("<td class=\"n\" data-v=\"").append(v).append("\">")
                .append(esc(String.format(Locale.ROOT, format, v))).append("</td>");
    }

    /** A relative link: each path segment percent-encoded (RFC 3986), '/' kept. */
    static String href(String relativePath) {
        StringBuilder sb = new StringBuilder();
        for (String seg : relativePath.split("/", -1)) {
            if (sb.length() > 0) sb.append('/');
            sb.append(URLEncoder.encode(seg, StandardCharsets.UTF_8).replace("+", "%20"));
        }
        return sb.toString();
    }
}
