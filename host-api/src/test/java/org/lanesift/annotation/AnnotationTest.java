package org.lanesift.annotation;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import org.junit.jupiter.api.Test;

class AnnotationTest {
    @Test
    void builderKeepsTypedFieldsInOrder() {
        Annotation a = Annotation.on("lane0", "packet").span(10, 20).label("DCS long write").severity(Severity.WARNING)
                .number("wordCount", 4, "B").text("type", "DCS long write").field("payload", Field.bytes(new byte[] {(byte) 0xB9, 0x12}))
                .field("dataType", Field.enumValue("DCS_LONG_WRITE")).build();
        assertEquals(java.util.List.of("wordCount", "type", "payload", "dataType"), java.util.List.copyOf(a.fields().keySet()));
        assertEquals("B9 12", a.fields().get("payload").toString());
        assertEquals("4.0 B", a.fields().get("wordCount").toString());
        assertEquals(Field.bytes(new byte[] {(byte) 0xB9, 0x12}), a.fields().get("payload"));
        assertEquals(4.0, a.fields().get("wordCount").asDouble());
        assertThrows(UnsupportedOperationException.class, () -> a.fields().put("x", Field.text("y")));
    }

    @Test
    void badAnnotationsAreRefused() {
        assertThrows(IllegalArgumentException.class, () -> Annotation.on("t", "k").span(20, 10).build());
        assertThrows(IllegalArgumentException.class, () -> new Field(Field.Type.NUMBER, "x", "V"));
        assertThrows(IllegalStateException.class, () -> Field.text("x").asDouble());
    }
}
