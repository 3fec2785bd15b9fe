package org.lanesift.annotation;

import java.util.Arrays;
import java.util.Objects;

/**
 * A typed value attached to an annotation: a number with its unit, a text, a named enumeration
 * value, or bytes.
 *
 * @param type  what the value is
 * @param value a {@link Double} or {@link Long} for {@link Type#NUMBER}, a {@link String} for
 *              {@link Type#TEXT} and {@link Type#ENUM}, a {@code byte[]} for {@link Type#BYTES}
 * @param unit  SI unit symbol of a number ("V", "s", "Hz", "%", "px"), or "" when it has none
 */
public record Field(Type type, Object value, String unit) {

    /** Field types. */
    public enum Type {
        /** A number with a unit. */
        NUMBER,
        /** Free text. */
        TEXT,
        /** One name out of a fixed set, such as a data type name. */
        ENUM,
        /** Raw bytes, such as a command's parameters. */
        BYTES
    }

    /**
     * Checks the value matches the type.
     *
     * @param type what the value is
     * @param value a {@link Double} or {@link Long} for {@link Type#NUMBER}, a {@link String} for {@link Type#TEXT} and {@link Type#ENUM}, a {@code byte[]} for {@link Type#BYTES}
     * @param unit SI unit symbol of a number ("V", "s", "Hz", "%", "px"), or "" when it has none
     */
    public Field {
        Objects.requireNonNull(type, "type");
        Objects.requireNonNull(value, "value");
        unit = unit == null ? "" : unit;
        boolean ok = switch (type) {
            case NUMBER -> value instanceof Double || value instanceof Long;
            case TEXT, ENUM -> value instanceof String;
            case BYTES -> value instanceof byte[];
        };
        if (!ok) {
            throw new IllegalArgumentException("field of type " + type + " cannot hold a " + value.getClass().getSimpleName());
        }
    }

    /**
     * A real number with a unit.
     *
     * @param v    the value
     * @param unit unit symbol
     * @return the field
     */
    public static Field number(double v, String unit) {
        return new Field(Type.NUMBER, v, unit);
    }

    /**
     * An integer with a unit.
     *
     * @param v    the value
     * @param unit unit symbol
     * @return the field
     */
    public static Field integer(long v, String unit) {
        return new Field(Type.NUMBER, v, unit);
    }

    /**
     * A text.
     *
     * @param s the text
     * @return the field
     */
    public static Field text(String s) {
        return new Field(Type.TEXT, s, "");
    }

    /**
     * An enumeration value.
     *
     * @param name the value's name
     * @return the field
     */
    public static Field enumValue(String name) {
        return new Field(Type.ENUM, name, "");
    }

    /**
     * Bytes (copied).
     *
     * @param b the bytes
     * @return the field
     */
    public static Field bytes(byte[] b) {
        return new Field(Type.BYTES, b.clone(), "");
    }

    /**
     * The value as a double, for numbers.
     *
     * @return the number
     * @throws IllegalStateException if the field is not a number
     */
    public double asDouble() {
        if (type != Type.NUMBER) {
            throw new IllegalStateException("field is " + type + ", not a number");
        }
        return ((Number) value).doubleValue();
    }

    @Override
    public boolean equals(Object o) {
        if (!(o instanceof Field f)) {
            return false;
        }
        return type == f.type && unit.equals(f.unit)
                && (type == Type.BYTES ? Arrays.equals((byte[]) value, (byte[]) f.value) : value.equals(f.value));
    }

    @Override
    public int hashCode() {
        return Objects.hash(type, unit, type == Type.BYTES ? Arrays.hashCode((byte[]) value) : value);
    }

    @Override
    public String toString() {
        String v = type == Type.BYTES ? hex((byte[]) value) : String.valueOf(value);
        return unit.isEmpty() ? v : v + " " + unit;
    }

    private static String hex(byte[] b) {
        StringBuilder sb = new StringBuilder();
        for (byte x : b) {
            if (sb.length() > 0) {
                sb.append(' ');
            }
            sb.append(Character.forDigit((x >> 4) & 15, 16)).append(Character.forDigit(x & 15, 16));
        }
        return sb.toString().toUpperCase(java.util.Locale.ROOT);
    }
}
