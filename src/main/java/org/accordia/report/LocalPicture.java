package org.accordia.report;

import java.awt.BasicStroke;
import java.util.List;
import org.accordia.consensus.BorderProfile;
import org.accordia.shift.LocalEffect;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.axis.CategoryAxis;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.plot.CategoryPlot;
import org.jfree.chart.plot.PlotOrientation;
import org.jfree.chart.renderer.category.BarRenderer;
import org.jfree.chart.renderer.category.StandardBarPainter;
import org.jfree.data.category.DefaultCategoryDataset;

/**
 * Where on the structure a centre differs: for each direction from the consensus centre (±x, ±y,
 * ±z along the image array axes), the share of each centre's border lying more than the
 * structure's tolerance outside the other centres' consensus. A uniform margin raises every
 * direction alike; a part added on one side raises one bar of one centre.
 */
final class LocalPicture {
    private LocalPicture() {
    }

    /** Whether the picture has something to show: some centre's local excess interval passes the minimum. */
    static boolean worthShowing(List<LocalEffect> local, double minimumExcess) {
        return local.stream().anyMatch(l -> l.beyond(minimumExcess));
    }

    /** The grouped bar chart (PNG). */
    static byte[] chart(List<LocalEffect> local, String structure, int widthPx, int heightPx) {
        DefaultCategoryDataset data = new DefaultCategoryDataset();
        for (LocalEffect l : local) {
            for (int d = 0; d < BorderProfile.DIRECTIONS; d++) {
                double v = l.outsideByDirection().get(d);
                data.addValue(Double.isNaN(v) ? null : 100 * v, l.centre(), BorderProfile.DIRECTION_NAMES.get(d));
            }
        }
        CategoryAxis x = new CategoryAxis("Direction from the consensus centre (image array axes)");
        NumberAxis y = new NumberAxis("Border beyond tolerance, outside (%)");
        y.setAutoRangeIncludesZero(true);
        BarRenderer r = new BarRenderer();
        r.setBarPainter(new StandardBarPainter());
        r.setShadowVisible(false);
        r.setItemMargin(0.05);
        for (int i = 0; i < local.size(); i++) {
            r.setSeriesPaint(i, Palette.category(i));
            r.setSeriesOutlineStroke(i, new BasicStroke(0.5f));
        }
        CategoryPlot plot = new CategoryPlot(data, x, y, r);
        plot.setOrientation(PlotOrientation.VERTICAL);
        Charts.stylePlot(plot);
        Charts.styleCategoryAxis(x);
        Charts.styleValueAxis(y);
        double tol = local.isEmpty() ? Double.NaN : local.get(0).toleranceMm();
        JFreeChart chart = Charts.chart("Where the centres' borders lie outside the others, " + structure, plot, true);
        Charts.note(chart, "Share of each centre's border more than " + org.accordia.shift.Wording.plain(tol, 3)
            + " mm outside the other centres' consensus, per direction; a one-sided extra part shows as one tall bar.");
        return Charts.render(chart, widthPx, heightPx);
    }
}
