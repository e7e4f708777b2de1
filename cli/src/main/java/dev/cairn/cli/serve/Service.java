package dev.cairn.cli.serve;

import java.net.URI;
import org.eclipse.jetty.server.HttpConfiguration;
import org.eclipse.jetty.server.HttpConnectionFactory;
import org.eclipse.jetty.server.Server;
import org.eclipse.jetty.server.ServerConnector;
import org.eclipse.jetty.util.thread.QueuedThreadPool;

/**
 * {@code cairn serve}: the HTTP/JSON service, Jetty's server with the {@link HttpApi} routes over a
 * {@link FitService}. Start it, ask its address, close it.
 */
public final class Service implements AutoCloseable {
    /** An idle connection is closed after this; a client should drop its idle connections sooner. */
    public static final long IDLE_TIMEOUT_MILLIS = 30_000;
    /**
     * The server's threads: a request's thread reads the body, checks the spec and queues the fit, then lets
     * go (the answer is written when the fit ends), so a few dozen serve a thousand open requests; each
     * thread also holds its own parser buffers, which is memory the load test bounds.
     */
    private static final int HTTP_THREADS = 48;
    private final Server server;
    private final ServerConnector connector;
    private final FitService fits;

    private Service(Server server, ServerConnector connector, FitService fits) {
        this.server = server;
        this.connector = connector;
        this.fits = fits;
    }

    /**
     * Starts the service.
     *
     * @param settings where it listens and its limits
     * @return the running service
     * @throws IllegalArgumentException for a data root or store that cannot be used
     * @throws java.io.IOException       when the address cannot be bound
     */
    public static Service start(ServiceSettings settings) throws java.io.IOException {
        FitService fits = new FitService(settings);
        QueuedThreadPool threads = new QueuedThreadPool(HTTP_THREADS, 4); // requests only parse and queue: few threads do
        threads.setName("cairn-http");
        threads.setDaemon(true);
        Server server = new Server(threads);
        HttpConfiguration http = new HttpConfiguration();
        http.setSendServerVersion(false);
        ServerConnector connector = new ServerConnector(server, new HttpConnectionFactory(http));
        connector.setHost(settings.host());
        connector.setPort(settings.port());
        connector.setIdleTimeout(IDLE_TIMEOUT_MILLIS);
        server.addConnector(connector);
        server.setHandler(new HttpApi(fits));
        server.setErrorHandler(new JsonErrors());
        server.setStopTimeout(5_000);
        try {
            server.start();
        } catch (java.io.IOException e) {
            fits.close();
            throw e;
        } catch (Exception e) {
            fits.close();
            throw new IllegalStateException("the server did not start: " + e, e);
        }
        return new Service(server, connector, fits);
    }

    /** {@return the address the service answers on, e.g. http://127.0.0.1:8731} */
    public URI address() {
        String host = connector.getHost() == null ? "127.0.0.1" : connector.getHost();
        return URI.create("http://" + (host.contains(":") ? "[" + host + "]" : host) + ":" + connector.getLocalPort());
    }

    /** Waits until the service is stopped (by {@link #close} or the process ending). */
    public void join() throws InterruptedException {
        server.join();
    }

    /** Stops answering, cancels running fits and releases the port. */
    @Override
    public void close() {
        try {
            server.stop();
        } catch (Exception e) {
            throw new IllegalStateException("the server did not stop cleanly: " + e, e);
        } finally {
            fits.close();
        }
    }
}
