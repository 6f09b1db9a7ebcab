package org.stillfield.viz;

import java.awt.image.BufferedImage;
import java.util.HashSet;
import java.util.Set;

/** Image checks shared by the chart tests. */
final class Pixels {
    private Pixels() {
    }

    /** @return number of distinct RGB values in the image */
    static int distinctColours(BufferedImage img) {
        Set<Integer> seen = new HashSet<>();
        for (int y = 0; y < img.getHeight(); y++) {
            for (int x = 0; x < img.getWidth(); x++) {
                seen.add(img.getRGB(x, y) & 0xFFFFFF);
            }
        }
        return seen.size();
    }

    /** @return number of pixels within {@code tol} per channel of the colour */
    static int count(BufferedImage img, int rgb, int tol) {
        int n = 0;
        for (int y = 0; y < img.getHeight(); y++) {
            for (int x = 0; x < img.getWidth(); x++) {
                if (close(img.getRGB(x, y), rgb, tol)) {
                    n++;
                }
            }
        }
        return n;
    }

    /** @return true when some pixel within {@code radius} of (cx, cy) matches the colour */
    static boolean near(BufferedImage img, double cx, double cy, int radius, int rgb, int tol) {
        for (int dy = -radius; dy <= radius; dy++) {
            for (int dx = -radius; dx <= radius; dx++) {
                int x = (int) Math.round(cx) + dx;
                int y = (int) Math.round(cy) + dy;
                if (x >= 0 && y >= 0 && x < img.getWidth() && y < img.getHeight() && close(img.getRGB(x, y), rgb, tol)) {
                    return true;
                }
            }
        }
        return false;
    }

    static boolean close(int a, int b, int tol) {
        for (int shift = 0; shift <= 16; shift += 8) {
            if (Math.abs(((a >> shift) & 0xFF) - ((b >> shift) & 0xFF)) > tol) {
                return false;
            }
        }
        return true;
    }

    static String hex(int rgb) {
        return String.format("#%06X", rgb & 0xFFFFFF);
    }
}
