package org.stillfield.sampler.api;

/** The tool's version, written into every dataset. */
public final class Version {
    /** Semantic version of the tool and of the dataset layout it writes. */
    public static final String VERSION = "0.1.0";
    /** Name and layout revision of the dataset format. */
    public static final String DATASET_FORMAT = "stillfield-dataset/2";

    private Version() {
    }
}
