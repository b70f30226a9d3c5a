package plumb.cli.report;

/**
 * The inline stylesheet and check script of the report page. Kept inline so the page needs
 * nothing but its own directory: no fonts, scripts or styles are fetched from anywhere.
 */
final class ReportStyle {

    private ReportStyle() {
    }

    /** Colours follow plot.Theme: ink, Tol blue as accent, Tol red for failures. */
    static final String CSS = """
            :root { --ink: #1e1e24; --muted: #5a5a66; --line: #dddde3; --accent: #4477aa;
                    --bad: #b2182b; --warn: #8a5a00; --good: #1f6e43; --paper: #ffffff; --band: #f4f5f8; }
            * { box-sizing: border-box; }
            body { margin: 0; color: var(--ink); background: var(--paper);
                   font: 16px/1.5 "DejaVu Sans", "Segoe UI", "Helvetica Neue", Arial, sans-serif; }
            header { padding: 1.6rem 2rem 1rem; border-bottom: 4px solid var(--accent); }
            header .brand { font-size: .8rem; letter-spacing: .14em; text-transform: uppercase; color: var(--accent); font-weight: bold; }
            h1 { margin: .2rem 0 .3rem; font-size: 1.9rem; overflow-wrap: anywhere; }
            .lead { margin: 0; color: var(--muted); }
            nav { position: sticky; top: 0; z-index: 1; display: flex; flex-wrap: wrap; gap: .3rem;
                  padding: .5rem 2rem; background: var(--band); border-bottom: 1px solid var(--line); }
            nav a { padding: .15rem .7rem; border-radius: 1rem; color: var(--ink); text-decoration: none;
                    border: 1px solid var(--line); background: var(--paper); font-size: .9rem; }
            nav a:hover { border-color: var(--accent); color: var(--accent); }
            main { max-width: 1180px; padding: 0 2rem 2rem; }
            section { margin-top: 2rem; padding-left: 1rem; border-left: 3px solid var(--line); }
            h2 { font-size: 1.35rem; margin: 0 0 .6rem; }
            h3 { font-size: 1.1rem; margin: 1.4rem 0 .4rem; }
            dl.facts { display: grid; grid-template-columns: max-content 1fr; gap: .25rem 1.2rem; margin: 0 0 1rem; }
            dl.facts dt { color: var(--muted); }
            dl.facts dd { margin: 0; overflow-wrap: anywhere; }
            .mono { font-family: "DejaVu Sans Mono", Menlo, Consolas, monospace; font-size: .9rem; }
            .muted { color: var(--muted); }
            .good { color: var(--good); }
            .bad { color: var(--bad); font-weight: bold; }
            .warn { color: var(--warn); }
            .box { border: 1px solid currentColor; border-radius: 4px; padding: .5rem 1rem; margin: .6rem 0; }
            .box ul { margin: .3rem 0 0; padding-left: 1.3rem; font-weight: normal; }
            figure { margin: 1rem 0; }
            figure img { max-width: 100%; height: auto; border: 1px solid var(--line); display: block; }
            figcaption { color: var(--muted); font-size: .92rem; margin-top: .3rem; }
            .pair { display: flex; flex-wrap: wrap; gap: 1rem; }
            .pair figure { flex: 1 1 480px; min-width: 0; }
            .table { overflow-x: auto; margin: .8rem 0 1.2rem; }
            table { border-collapse: collapse; font-size: .92rem; font-variant-numeric: tabular-nums; }
            caption { text-align: left; font-weight: bold; padding-bottom: .3rem; }
            th, td { padding: .25rem .7rem; border-bottom: 1px solid var(--line); text-align: left; white-space: nowrap; }
            th { background: var(--band); border-bottom: 2px solid var(--ink); }
            td.num, th.num { text-align: right; }
            tbody tr:nth-child(even) { background: #fafafc; }
            .downloads { font-size: .85rem; color: var(--muted); display: block; margin-top: .3rem; }
            .downloads a { margin-left: .4rem; }
            footer { padding: 1rem 2rem 2rem; color: var(--muted); font-size: .85rem; border-top: 1px solid var(--line); }
            @media print { nav { display: none; } section { break-inside: avoid-page; border: 0; padding: 0; } }
            """;

    /**
     * Marks the page once everything has loaded: {@code <body data-check="ok">}, or "failed" with
     * {@code data-broken} naming images that did not load and {@code data-errors} carrying script
     * errors. A reader sees a red notice; the browser test reads the attributes.
     */
    static final String CHECK_SCRIPT = """
            (function () {
              var errors = [];
              window.addEventListener('error', function (e) {
                var t = e.target;
                errors.push(t && t.tagName ? 'could not load ' + (t.getAttribute('src') || t.tagName) : String(e.message));
              }, true);
              window.addEventListener('load', function () {
                var broken = [];
                for (var i = 0; i < document.images.length; i++) {
                  var img = document.images[i];
                  if (!img.complete || img.naturalWidth === 0) broken.push(img.getAttribute('src'));
                }
                var ok = errors.length === 0 && broken.length === 0;
                document.body.setAttribute('data-check', ok ? 'ok' : 'failed');
                document.body.setAttribute('data-images', String(document.images.length));
                if (!ok) {
                  document.body.setAttribute('data-broken', broken.join(' '));
                  document.body.setAttribute('data-errors', errors.join(' | '));
                  document.getElementById('broken').hidden = false;
                }
              });
            })();
            """;
}
