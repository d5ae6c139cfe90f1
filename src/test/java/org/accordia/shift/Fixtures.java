package org.accordia.shift;

import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.io.Reader;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVRecord;

/** Reads the committed reference fixtures under src/test/resources/fixtures/shift. */
final class Fixtures {
    private Fixtures() {
    }

    static List<CSVRecord> csv(String name) throws IOException {
        InputStream in = Fixtures.class.getResourceAsStream("/fixtures/shift/" + name);
        if (in == null) {
            throw new IOException("missing fixture " + name);
        }
        try (Reader reader = new InputStreamReader(in, StandardCharsets.UTF_8)) {
            return new ArrayList<>(CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true)
                    .setAllowMissingColumnNames(true).get()
                    .parse(reader).getRecords());
        }
    }

    /** A square matrix written by R's write.csv(as.matrix(d)): row names in the first column. */
    static double[][] matrix(String name) throws IOException {
        List<CSVRecord> rows = csv(name);
        double[][] m = new double[rows.size()][];
        for (int i = 0; i < rows.size(); i++) {
            CSVRecord r = rows.get(i);
            m[i] = new double[r.size() - 1];
            for (int j = 1; j < r.size(); j++) {
                m[i][j - 1] = Double.parseDouble(r.get(j));
            }
        }
        return m;
    }

    /** Row names of a matrix written by R's write.csv(as.matrix(d)). */
    static List<String> matrixNames(String name) throws IOException {
        return csv(name).stream().map(r -> r.get(0)).toList();
    }

    /** component → value from the *_lme4.csv files. */
    static Map<String, Double> components(String name) throws IOException {
        Map<String, Double> out = new LinkedHashMap<>();
        for (CSVRecord r : csv(name)) {
            out.put(r.get("component"), Double.parseDouble(r.get("variance")));
        }
        return out;
    }

    /** Level indices of a column (levels numbered in sorted order of their names). */
    static int[] levels(List<CSVRecord> rows, String... columns) {
        java.util.TreeMap<String, Integer> index = new java.util.TreeMap<>();
        List<String> keys = new ArrayList<>();
        for (CSVRecord r : rows) {
            StringBuilder key = new StringBuilder();
            for (String c : columns) {
                key.append(r.get(c)).append('\u0000');
            }
            keys.add(key.toString());
            index.put(key.toString(), 0);
        }
        int k = 0;
        for (Map.Entry<String, Integer> e : index.entrySet()) {
            e.setValue(k++);
        }
        return keys.stream().mapToInt(index::get).toArray();
    }
}
