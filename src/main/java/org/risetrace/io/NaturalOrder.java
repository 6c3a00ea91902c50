package org.risetrace.io;

import java.util.Comparator;

/**
 * File-name order as people read it: runs of digits compare by value ({@code f2} before {@code f10}), the rest
 * case-insensitively; ties (e.g. {@code f01} and {@code f1}) fall back to the plain string order.
 */
public final class NaturalOrder implements Comparator<String> {
    public static final NaturalOrder INSTANCE = new NaturalOrder();

    @Override
    public int compare(String a, String b) {
        int i = 0, j = 0;
        while (i < a.length() && j < b.length()) {
            char ca = a.charAt(i), cb = b.charAt(j);
            if (Character.isDigit(ca) && Character.isDigit(cb)) {
                int si = i, sj = j;
                while (si < a.length() && a.charAt(si) == '0') si++;
                while (sj < b.length() && b.charAt(sj) == '0') sj++;
                int ei = si, ej = sj;
                while (ei < a.length() && Character.isDigit(a.charAt(ei))) ei++;
                while (ej < b.length() && Character.isDigit(b.charAt(ej))) ej++;
                int lenA = ei - si, lenB = ej - sj;
                if (lenA != lenB) return Integer.compare(lenA, lenB);
                for (int k = 0; k < lenA; k++) {
                    int d = Character.compare(a.charAt(si + k), b.charAt(sj + k));
                    if (d != 0) return d;
                }
                i = ei;
                j = ej;
            } else {
                int d = Character.compare(Character.toLowerCase(ca), Character.toLowerCase(cb));
                if (d != 0) return d;
                i++;
                j++;
            }
        }
        int d = Integer.compare(a.length() - i, b.length() - j);
        return d != 0 ? d : a.compareTo(b);
    }
}
