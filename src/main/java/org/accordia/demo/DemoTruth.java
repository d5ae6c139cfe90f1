package org.accordia.demo;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import java.io.IOException;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import org.accordia.io.InputException;

/**
 * What the demo generator planted, written as {@code demo-truth.json} next to the study so that
 * tests can check that the analysis finds it.
 *
 * @param scenario one-paragraph description of the fictional scenario
 * @param seed the generator's seed
 * @param spec the full generator specification
 * @param centres every centre with its fictional country and readers
 * @param shiftedCentre the centre whose readers draw a systematically wider margin, or null
 * @param centreShiftMm that centre's margin shift in mm (0 when none)
 * @param missingLesionCentre centre of the reader who misses the small second lesion, or null
 * @param missingLesionReader that reader, or null
 * @param missedLesionCases the cases in which that reader misses it
 * @param hardCases cases with large disagreement between readers
 * @param casesWithCore cases that carry label 2 (core) inside label 1
 * @param casesWithSecondLesion cases with a small second lesion
 * @param readerBiasMm each reader's personal margin bias in mm, keyed "centre/reader"
 */
public record DemoTruth(String scenario, long seed, DemoSpec spec, List<CentreInfo> centres, String shiftedCentre,
                        double centreShiftMm, String missingLesionCentre, String missingLesionReader,
                        List<String> missedLesionCases, List<String> hardCases, List<String> casesWithCore,
                        List<String> casesWithSecondLesion, Map<String, Double> readerBiasMm) {

    /** File name of the truth record inside a generated study. */
    public static final String FILE_NAME = "demo-truth.json";

    /** A fictional centre. */
    public record CentreInfo(String centre, String country, List<String> readers) {
    }

    static ObjectMapper mapper() {
        return new ObjectMapper()
            .enable(SerializationFeature.INDENT_OUTPUT)
            .enable(SerializationFeature.ORDER_MAP_ENTRIES_BY_KEYS);
    }

    /** Reads a truth record written by the generator. */
    public static DemoTruth read(Path file) throws InputException {
        try {
            return mapper().readValue(file.toFile(), DemoTruth.class);
        } catch (IOException e) {
            throw new InputException(file, "cannot read demo truth: " + e.getMessage().replace('\n', ' '), e);
        }
    }
}
