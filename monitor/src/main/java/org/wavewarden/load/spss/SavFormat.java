package org.wavewarden.load.spss;

import org.wavewarden.codebook.StorageType;

/**
 * A variable's print format as the system file packs it into one int32: type code, width and decimals. The type
 * codes are those of the format description's table of output formats.
 */
record SavFormat(int type, int width, int decimals) {

    private static final String[] NAMES = new String[42];

    static {
        String[] pairs = {"1", "A", "2", "AHEX", "3", "COMMA", "4", "DOLLAR", "5", "F", "6", "IB", "7", "PIBHEX",
                "8", "P", "9", "PIB", "10", "PK", "11", "RB", "12", "RBHEX", "15", "Z", "16", "N", "17", "E",
                "20", "DATE", "21", "TIME", "22", "DATETIME", "23", "ADATE", "24", "JDATE", "25", "DTIME",
                "26", "WKDAY", "27", "MONTH", "28", "MOYR", "29", "QYR", "30", "WKYR", "31", "PCT", "32", "DOT",
                "33", "CCA", "34", "CCB", "35", "CCC", "36", "CCD", "37", "CCE", "38", "EDATE", "39", "SDATE",
                "40", "MTIME", "41", "YMDHMS"};
        for (int i = 0; i < pairs.length; i += 2) {
            NAMES[Integer.parseInt(pairs[i])] = pairs[i + 1];
        }
    }

    static SavFormat unpack(int packed) {
        return new SavFormat((packed >>> 16) & 0xff, (packed >>> 8) & 0xff, packed & 0xff);
    }

    String name() {
        return type >= 0 && type < NAMES.length && NAMES[type] != null ? NAMES[type] : "FORMAT" + type;
    }

    /**
     * Calendar formats hold a day (seconds since 1582-10-14 at midnight); DATETIME and YMDHMS a moment. TIME, DTIME
     * and MTIME are durations, WKDAY and MONTH a number of a day or month: those stay numbers.
     */
    StorageType numericStorage() {
        return switch (name()) {
            case "DATE", "ADATE", "EDATE", "SDATE", "JDATE", "MOYR", "QYR", "WKYR" -> StorageType.DATE;
            case "DATETIME", "YMDHMS" -> StorageType.DATETIME;
            default -> StorageType.NUMBER;
        };
    }

    /**
     * The format as SPSS syntax writes it ("F8.2", "A20", "DATE11"): decimals are shown for the plain number formats
     * always, for others only when there are some (the form R's haven gives as {@code format.spss}).
     */
    String text(boolean string, int stringWidth) {
        if (string) {
            return name() + (name().equals("AHEX") ? width : stringWidth);
        }
        boolean plain = switch (name()) {
            case "F", "COMMA", "DOLLAR", "PCT", "DOT", "E", "N", "Z", "CCA", "CCB", "CCC", "CCD", "CCE" -> true;
            default -> false;
        };
        return name() + width + (plain || decimals > 0 ? "." + decimals : "");
    }
}
