using System.Net.Sockets;

namespace ModelWatch.Testing.Postgres;

/// <summary>Whether a Docker engine may answer, checked cheaply before Testcontainers is asked to start anything.</summary>
public static class DockerEngine
{
    /// <summary>True when <c>DOCKER_HOST</c> is set or the default socket accepts a connection.</summary>
    public static bool MayAnswer()
    {
        if (!string.IsNullOrEmpty(Environment.GetEnvironmentVariable("DOCKER_HOST")))
        {
            return true;
        }

        const string socket = "/var/run/docker.sock";
        if (!File.Exists(socket))
        {
            return false;
        }

        try
        {
            using var probe = new Socket(AddressFamily.Unix, SocketType.Stream, ProtocolType.Unspecified);
            probe.Connect(new UnixDomainSocketEndPoint(socket));
            return true;
        }
        catch (SocketException)
        {
            return false;
        }
    }
}
