package org.wavewarden.compare;

import org.wavewarden.compare.relation.CorrelationDifferenceResult;
import org.wavewarden.compare.relation.CorrelationResult;

import java.lang.reflect.Constructor;
import java.lang.reflect.InvocationTargetException;
import java.lang.reflect.RecordComponent;
import java.util.ArrayList;
import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * A comparison's detail as a complete enumeration (a census or a full register) reports it: every interval in it
 * collapsed onto its estimate, so that neither the stored findings nor the digest's plots show a sampling error that
 * a count of every unit does not have.
 *
 * <p>The intervals a detail can carry are those of four values, each of which knows how to drop its own
 * ({@link EffectSize#exact()}, {@link WaveEstimates.Estimate#exact()}, {@link CorrelationResult#exact()},
 * {@link CorrelationDifferenceResult#exact()}). The details themselves are many records of many shapes, nested in
 * one another and in lists; rather than each of them repeating the walk (and a new one forgetting it), this class
 * walks any record, list or map and rebuilds only what holds such a value. Everything else (counts, shares, test
 * statistics, strings) is kept as it is, and a detail without an interval is returned unchanged, the same object.
 */
public final class ExactDetail {

    private ExactDetail() {
    }

    /** {@code detail} with every interval collapsed onto its estimate; null stays null. */
    public static Object of(Object detail) {
        return exact(detail);
    }

    private static Object exact(Object o) {
        if (o instanceof EffectSize e) {
            return e.exact();
        }
        if (o instanceof WaveEstimates.Estimate e) {
            return e.exact();
        }
        if (o instanceof CorrelationResult r) {
            return r.exact();
        }
        if (o instanceof CorrelationDifferenceResult r) {
            return r.exact();
        }
        if (o instanceof List<?> list) {
            List<Object> out = new ArrayList<>(list.size());
            boolean changed = false;
            for (Object x : list) {
                Object y = exact(x);
                changed |= y != x;
                out.add(y);
            }
            // Entries may be null (a wave without an estimate), which List.copyOf would refuse.
            return changed ? Collections.unmodifiableList(out) : list;
        }
        if (o instanceof Map<?, ?> map) {
            Map<Object, Object> out = new LinkedHashMap<>();
            boolean changed = false;
            for (Map.Entry<?, ?> e : map.entrySet()) {
                Object y = exact(e.getValue());
                changed |= y != e.getValue();
                out.put(e.getKey(), y);
            }
            return changed ? Collections.unmodifiableMap(out) : map;
        }
        if (o != null && o.getClass().isRecord()) {
            return record((Record) o);
        }
        return o;
    }

    private static Object record(Record r) {
        RecordComponent[] components = r.getClass().getRecordComponents();
        Object[] values = new Object[components.length];
        Class<?>[] types = new Class<?>[components.length];
        boolean changed = false;
        try {
            for (int i = 0; i < components.length; i++) {
                var accessor = components[i].getAccessor();
                // Some details are package-private records of their comparator.
                accessor.setAccessible(true);
                Object v = accessor.invoke(r);
                values[i] = exact(v);
                types[i] = components[i].getType();
                changed |= values[i] != v;
            }
            if (!changed) {
                return r;
            }
            Constructor<?> canonical = r.getClass().getDeclaredConstructor(types);
            canonical.setAccessible(true);
            return canonical.newInstance(values);
        } catch (NoSuchMethodException | IllegalAccessException | InstantiationException e) {
            throw new IllegalStateException("the detail " + r.getClass().getName() + " cannot be rebuilt", e);
        } catch (InvocationTargetException e) {
            throw new IllegalStateException("the detail " + r.getClass().getName() + " cannot be rebuilt: "
                    + e.getCause(), e.getCause());
        }
    }
}
