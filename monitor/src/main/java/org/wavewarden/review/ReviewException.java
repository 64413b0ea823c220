package org.wavewarden.review;

/** An action on an alert or a wave that cannot be taken, with the reason in words a person can act on. */
public class ReviewException extends RuntimeException {

    public ReviewException(String message) {
        super(message);
    }
}
