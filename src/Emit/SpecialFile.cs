using Mono.Unix;

namespace Emit;

/// <summary>
/// What kind of file system entry a path names; .NET's <see cref="FileInfo"/> calls a FIFO or a device a normal file.
/// </summary>
public enum SpecialFileKind
{
    /// <summary>Nothing at the path.</summary>
    Missing,
    /// <summary>A regular file.</summary>
    RegularFile,
    /// <summary>A directory.</summary>
    Directory,
    /// <summary>A symbolic link (not followed).</summary>
    Link,
    /// <summary>A character device such as /dev/zero.</summary>
    CharacterDevice,
    /// <summary>A FIFO, socket or block device.</summary>
    Other,
}

/// <summary>Tells regular files from devices, FIFOs and links (lstat through Mono.Unix on Unix).</summary>
public static class SpecialFile
{
    /// <summary>
    /// What <paramref name="path"/> names; <paramref name="followLinks"/> looks through a symbolic link.
    /// </summary>
    public static SpecialFileKind KindOf(string path, bool followLinks)
    {
        if (OperatingSystem.IsWindows())
        {
            var info = new FileInfo(path);
            if (Directory.Exists(path)) return SpecialFileKind.Directory;
            if (info.LinkTarget is not null)
                return followLinks && File.Exists(path) ? SpecialFileKind.RegularFile : SpecialFileKind.Link;
            return info.Exists ? SpecialFileKind.RegularFile : SpecialFileKind.Missing;
        }
        UnixFileSystemInfo entry = followLinks ? new UnixFileInfo(path) : new UnixSymbolicLinkInfo(path);
        if (!entry.Exists) return SpecialFileKind.Missing;
        return entry.FileType switch
        {
            FileTypes.RegularFile => SpecialFileKind.RegularFile,
            FileTypes.Directory => SpecialFileKind.Directory,
            FileTypes.SymbolicLink => SpecialFileKind.Link,
            FileTypes.CharacterDevice => SpecialFileKind.CharacterDevice,
            _ => SpecialFileKind.Other,
        };
    }
}
