package org.lanesift.testkit;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.lanesift.json.JsonReader;
import org.lanesift.json.JsonValue;

/**
 * Looks into a JSON report in a test through the project's JSON reader, never by searching its
 * text: the report is parsed, its members are listed in document order (each with its RFC 6901
 * pointer), and a test asks for the first member of a name, optionally after another member.
 */
public final class JsonScan {
    /**
     * One member of an object.
     *
     * @param pointer RFC 6901 pointer of the member's value
     * @param name    member name
     * @param value   member value
     */
    public record Member(String pointer, String name, JsonValue value) {
    }

    private JsonScan() {
    }

    /**
     * Parses a report.
     *
     * @param what name for messages
     * @param json the text
     * @return the value
     */
    public static JsonValue parse(String what, String json) {
        return JsonReader.parse(what, json);
    }

    /**
     * Every member of every object, in document order (a member before the members inside its value).
     *
     * @param root the parsed report
     * @return the members
     */
    public static List<Member> members(JsonValue root) {
        List<Member> out = new ArrayList<>();
        walk(root, "", out);
        return out;
    }

    private static void walk(JsonValue v, String pointer, List<Member> out) {
        if (v.isObject()) {
            for (Map.Entry<String, JsonValue> e : v.members().entrySet()) {
                String p = pointer + "/" + e.getKey().replace("~", "~0").replace("/", "~1");
                out.add(new Member(p, e.getKey(), e.getValue()));
                walk(e.getValue(), p, out);
            }
        } else if (v.isArray()) {
            for (int i = 0; i < v.elements().size(); i++) {
                walk(v.elements().get(i), pointer + "/" + i, out);
            }
        }
    }

    /**
     * The first member named {@code key} whose value is not an object or array; a value with its
     * source ({@code {"value": 1.5, "unit": "ps", "source": "measured"}}) counts as its {@code value}.
     *
     * @param root the parsed report
     * @param key  member name
     * @return the member
     * @throws AssertionError if there is none
     */
    public static Member first(JsonValue root, String key) {
        return firstFrom(root, members(root), 0, key);
    }

    /**
     * The first member named {@code key} with a scalar value that comes after the first member
     * named {@code anchor} (whose value equals {@code anchorValue}, when that is not null; compared
     * with the value's compact JSON text, such as {@code 1} or {@code "rx"}).
     *
     * @param root        the parsed report
     * @param anchor      name of the member to start after
     * @param anchorValue compact JSON text the anchor's value must have, or null for any value
     * @param key         member name
     * @return the member
     * @throws AssertionError if there is no such anchor or member
     */
    public static Member after(JsonValue root, String anchor, String anchorValue, String key) {
        List<Member> all = members(root);
        for (int i = 0; i < all.size(); i++) {
            Member m = all.get(i);
            if (m.name().equals(anchor) && (anchorValue == null || anchorValue.equals(m.value().toString()))) {
                return firstFrom(root, all, i + 1, key);
            }
        }
        throw new AssertionError("no member \"" + anchor + "\"" + (anchorValue == null ? "" : " = " + anchorValue) + " in " + root);
    }

    private static Member firstFrom(JsonValue root, List<Member> all, int from, String key) {
        for (int i = from; i < all.size(); i++) {
            Member m = all.get(i);
            if (m.name().equals(key) && !m.value().isObject() && !m.value().isArray()) {
                return m;
            }
            JsonValue inner = m.value().isObject() && m.value().get("source") != null ? m.value().get("value") : null;
            if (m.name().equals(key) && inner != null && !inner.isObject() && !inner.isArray()) {
                return new Member(m.pointer() + "/value", key, inner); // a value with its source (host-api Sourced)
            }
        }
        throw new AssertionError("no member \"" + key + "\" with a plain value in " + root);
    }

    /**
     * A member's value as a number: a number as such, null as NaN, true as 1 and false as 0.
     *
     * @param m the member
     * @return the number
     * @throws AssertionError if the value is a string
     */
    public static double number(Member m) {
        JsonValue v = m.value();
        if (v.isNumber()) {
            return v.asDouble();
        }
        if (v.isNull()) {
            return Double.NaN;
        }
        if (v.isBoolean()) {
            return v.asBoolean() ? 1 : 0;
        }
        throw new AssertionError(m.pointer() + " is " + v.describe() + ", expected a number");
    }

    /**
     * The number of the first member named {@code key}.
     *
     * @param root the parsed report
     * @param key  member name
     * @return the number
     */
    public static double number(JsonValue root, String key) {
        return number(first(root, key));
    }

    /**
     * How many members are named {@code key}, anywhere.
     *
     * @param root the parsed report
     * @param key  member name
     * @return the count
     */
    public static int count(JsonValue root, String key) {
        return (int) members(root).stream().filter(m -> m.name().equals(key)).count();
    }
}
