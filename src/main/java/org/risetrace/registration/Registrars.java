package org.risetrace.registration;

import org.risetrace.board.Board;
import org.risetrace.frame.Frame;

/** Builds registrars. */
public final class Registrars {
    private Registrars() {
    }

    /**
     * A registrar for frames of the series whose reference frame is {@code reference} (the frame named in
     * board.outline.frame). The reference is prepared once (pyramid, selected pixels, features) and shared
     * read-only; the result is thread-safe.
     */
    public static Registrar create(Frame reference, Board board, RegistrationConfig config) {
        return new DirectRegistrar(ReferenceModel.prepare(reference, board, config), config);
    }

    /**
     * As {@link #create}, for a camera the user declares still (on a stand): a frame that cannot be aligned takes
     * the outline as marked instead of failing; a trusted alignment that shows the camera moved fails the frame.
     */
    public static Registrar still(Frame reference, Board board, RegistrationConfig config) {
        return new StillCameraRegistrar(create(reference, board, config), board, reference);
    }
}
