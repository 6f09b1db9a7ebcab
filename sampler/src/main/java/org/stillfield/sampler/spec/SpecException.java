package org.stillfield.sampler.spec;

/**
 * A run spec that cannot be used: names the setting (a dotted path such as {@code cavity.a_m})
 * and says what is allowed.
 */
public final class SpecException extends Exception {
    private final String setting;

    /**
     * @param setting dotted path of the offending setting, or "" for the whole file
     * @param message what is wrong and what is allowed
     */
    public SpecException(String setting, String message) {
        super(setting.isEmpty() ? message : setting + ": " + message);
        this.setting = setting;
    }

    /** @return dotted path of the offending setting */
    public String setting() {
        return setting;
    }
}
