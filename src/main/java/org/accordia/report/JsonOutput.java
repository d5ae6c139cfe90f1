package org.accordia.report;

import com.fasterxml.jackson.core.JsonGenerator;
import com.fasterxml.jackson.core.util.DefaultIndenter;
import com.fasterxml.jackson.core.util.DefaultPrettyPrinter;
import com.fasterxml.jackson.core.util.Separators;
import com.fasterxml.jackson.databind.MapperFeature;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import com.fasterxml.jackson.databind.SerializerProvider;
import com.fasterxml.jackson.databind.json.JsonMapper;
import com.fasterxml.jackson.databind.module.SimpleModule;
import com.fasterxml.jackson.databind.ser.std.StdSerializer;
import java.io.IOException;
import java.io.OutputStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;

/**
 * Deterministic JSON (the summary file): the same value gives byte-identical output.
 *
 * <ul>
 *   <li>UTF-8, two-space indent, LF line endings, {@code "key": value}, a final newline.</li>
 *   <li>Map entries sorted by key; record components in declaration order; bean properties in
 *       declaration order unless {@code @JsonPropertyOrder} says otherwise (never by hash order).</li>
 *   <li>Every {@code double}/{@code float} (also inside arrays) written by {@link Numbers#format(double)}
 *       (six significant digits, the same text as in the CSV files); NaN and infinities as {@code null}.</li>
 *   <li>Null fields are written as {@code null}, not dropped, so every file has the same keys.</li>
 * </ul>
 */
public final class JsonOutput {

    private JsonOutput() {
    }

    /** A new mapper with the configuration above (mappers are thread-safe once configured). */
    public static ObjectMapper mapper() {
        SimpleModule numbers = new SimpleModule("accordia-numbers");
        numbers.addSerializer(Double.class, new DoubleSerializer<>(Double.class));
        numbers.addSerializer(double.class, new DoubleSerializer<>(Double.class));
        numbers.addSerializer(Float.class, new DoubleSerializer<>(Float.class));
        numbers.addSerializer(float.class, new DoubleSerializer<>(Float.class));
        numbers.addSerializer(double[].class, new StdSerializer<double[]>(double[].class) {
            @Override
            public void serialize(double[] values, JsonGenerator gen, SerializerProvider provider) throws IOException {
                gen.writeStartArray(values, values.length);
                for (double v : values) {
                    writeDouble(v, gen);
                }
                gen.writeEndArray();
            }
        });
        numbers.addSerializer(float[].class, new StdSerializer<float[]>(float[].class) {
            @Override
            public void serialize(float[] values, JsonGenerator gen, SerializerProvider provider) throws IOException {
                gen.writeStartArray(values, values.length);
                for (float v : values) {
                    writeDouble(v, gen);
                }
                gen.writeEndArray();
            }
        });
        DefaultIndenter indenter = new DefaultIndenter("  ", "\n");
        DefaultPrettyPrinter printer = new DefaultPrettyPrinter()
            .withSeparators(Separators.createDefaultInstance()
                .withObjectFieldValueSpacing(Separators.Spacing.AFTER));
        printer.indentObjectsWith(indenter);
        printer.indentArraysWith(indenter);
        return JsonMapper.builder()
            .addModule(numbers)
            .enable(SerializationFeature.ORDER_MAP_ENTRIES_BY_KEYS)
            .enable(SerializationFeature.INDENT_OUTPUT)
            .disable(MapperFeature.SORT_PROPERTIES_ALPHABETICALLY)
            .disable(JsonGenerator.Feature.AUTO_CLOSE_TARGET)
            .defaultPrettyPrinter(printer)
            .build();
    }

    /** The JSON text of {@code value}, ending with a newline. */
    public static String toJson(Object value) {
        try {
            return mapper().writeValueAsString(value) + "\n";
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /** Writes the JSON of {@code value} as UTF-8 to {@code out}, ending with a newline; does not close it. */
    public static void write(Object value, OutputStream out) throws IOException {
        out.write(toJson(value).getBytes(StandardCharsets.UTF_8));
        out.flush();
    }

    private static void writeDouble(double v, JsonGenerator gen) throws IOException {
        if (Numbers.isDefined(v)) {
            gen.writeNumber(Numbers.format(v));
        } else {
            gen.writeNull();
        }
    }

    private static final class DoubleSerializer<T extends java.lang.Number> extends StdSerializer<T> {
        private static final long serialVersionUID = 1L;

        DoubleSerializer(Class<T> type) {
            super(type);
        }

        @Override
        public void serialize(T value, JsonGenerator gen, SerializerProvider provider) throws IOException {
            writeDouble(value.doubleValue(), gen);
        }
    }
}
