package org.accordia.demo;

import java.util.List;

/**
 * Plants beyond {@link DemoSpec} for simulated studies (calibration scenarios); the committed demo
 * study uses {@link #NONE}, so its files do not change. With NONE the generator draws exactly what
 * it draws from the spec alone.
 *
 * @param readersByCentre readers at each centre, in centre order (each 1..26; its size must equal
 *     the spec's number of centres), or empty for {@link DemoSpec#readersPerCentre()} everywhere
 * @param wideReaderCentre centre index (from 0) of the one reader drawing a wider margin, or −1
 * @param wideReaderIndex that reader's index within its centre (from 0), or −1
 * @param wideReaderMm how much wider that reader draws, mm (added to its personal bias in every case)
 * @param inclusionCentre centre index (from 0) whose readers add a local one-sided inclusion, or −1
 * @param inclusionMm how far the inclusion reaches beyond the truth surface, mm: a ball of radius
 *     2/3 of this, centred so that it reaches this far out from the lesion's surface on one side
 *     (a direction in the x–y plane drawn per case), united with the lesion by every reader of that
 *     centre and grown with the reader's own margin like the rest of the drawing
 */
public record ExtraPlants(List<Integer> readersByCentre, int wideReaderCentre, int wideReaderIndex,
                          double wideReaderMm, int inclusionCentre, double inclusionMm) {

    /** Nothing beyond the spec. */
    public static final ExtraPlants NONE = new ExtraPlants(List.of(), -1, -1, 0, -1, 0);

    public ExtraPlants {
        readersByCentre = List.copyOf(readersByCentre);
        for (int n : readersByCentre) {
            check(n >= 1 && n <= 26, "readers per centre must lie in 1..26");
        }
        check(wideReaderCentre >= -1 && wideReaderIndex >= -1 && (wideReaderCentre < 0) == (wideReaderIndex < 0),
            "the wide reader needs both a centre and a reader index, or neither");
        check(Double.isFinite(wideReaderMm) && Math.abs(wideReaderMm) <= 10, "wide reader margin must lie in [-10, 10] mm");
        check(inclusionCentre >= -1, "inclusion centre must be an index or -1");
        check(Double.isFinite(inclusionMm) && inclusionMm >= 0 && inclusionMm <= 20, "inclusion must lie in [0, 20] mm");
    }

    private static void check(boolean ok, String message) {
        if (!ok) {
            throw new IllegalArgumentException(message);
        }
    }

    /** Unequal rosters: {@code counts[c]} readers at centre c. */
    public ExtraPlants withRoster(List<Integer> counts) {
        return new ExtraPlants(counts, wideReaderCentre, wideReaderIndex, wideReaderMm, inclusionCentre, inclusionMm);
    }

    /** Reader {@code reader} of centre {@code centre} (indices from 0) draws {@code mm} wider. */
    public ExtraPlants withWideReader(int centre, int reader, double mm) {
        return new ExtraPlants(readersByCentre, centre, reader, mm, inclusionCentre, inclusionMm);
    }

    /** Every reader of centre {@code centre} (index from 0) adds a one-sided inclusion reaching {@code mm} out. */
    public ExtraPlants withInclusion(int centre, double mm) {
        return new ExtraPlants(readersByCentre, wideReaderCentre, wideReaderIndex, wideReaderMm, centre, mm);
    }

    /** Readers at centre c under {@code spec}. */
    public int readersAt(DemoSpec spec, int c) {
        return readersByCentre.isEmpty() ? spec.readersPerCentre() : readersByCentre.get(c);
    }

    /** Whether anything beyond the spec is planted. */
    public boolean any() {
        return !readersByCentre.isEmpty() || wideReaderCentre >= 0 || (inclusionCentre >= 0 && inclusionMm > 0);
    }
}
